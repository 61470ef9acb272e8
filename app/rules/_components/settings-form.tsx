"use client";

import { useRef, useState, useTransition, type FormEvent } from "react";
import type { SettingDef } from "@/lib/domain/setting-def";
import { Alert } from "../../_components/alert";
import { Button } from "../../_components/button";
import { fieldErrorsOf, type FormState } from "../../_components/form-result";

/** Every setting grouped, the current values filled in; saving makes a new version. */
export function SettingsForm({ defs, values, version, action }: { defs: readonly SettingDef[]; values: Readonly<Record<string, number>>; version: number; action: (fd: FormData) => Promise<FormState> }) {
  const [state, setState] = useState<FormState>(null);
  const [pending, startTransition] = useTransition();
  const alertRef = useRef<HTMLDivElement>(null);
  const errors = fieldErrorsOf(state);
  const groups = new Map<string, SettingDef[]>();
  for (const d of defs) groups.set(d.group, [...(groups.get(d.group) ?? []), d]);
  function onSubmit(e: FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const fd = new FormData(e.currentTarget);
    // Only changed values are sent; the server completes the rest from the current version.
    for (const d of defs) {
      const v = fd.get(`setting:${d.key}`);
      if (typeof v === "string" && Number(v.replace(",", ".")) === values[d.key]) fd.delete(`setting:${d.key}`);
    }
    startTransition(async () => {
      const r = await action(fd);
      setState(r);
      requestAnimationFrame(() => alertRef.current?.focus());
    });
  }
  return (
    <form onSubmit={onSubmit} noValidate>
      <input type="hidden" name="basedOnVersion" value={version} />
      <div ref={alertRef} tabIndex={-1}>
        {state ? (
          <Alert tone="error" title={state.error.code === "conflict" ? "Someone saved a newer version" : "Nothing was saved"}>
            <p>{state.error.message}</p>
          </Alert>
        ) : null}
      </div>
      {[...groups.entries()].map(([group, list]) => (
        <fieldset key={group} className="fieldset settings-group">
          <legend>{group}</legend>
          <div className="settings-grid">
            {list.map((d) => {
              const error = errors[`values.${d.key}`];
              const id = `setting-${d.key}`;
              return (
                <div key={d.key} className="field">
                  <label className="field__label" htmlFor={id}>
                    {d.label}
                    {d.unit ? <span className="muted"> ({d.unit})</span> : null}
                  </label>
                  <input className="input num" id={id} name={`setting:${d.key}`} defaultValue={String(values[d.key] ?? d.defaultValue)} inputMode="decimal" aria-invalid={Boolean(error) || undefined} aria-describedby={`${id}-hint${error ? ` ${id}-error` : ""}`} />
                  <span className="field__hint" id={`${id}-hint`}>
                    <code>{d.key}</code> · default {d.defaultValue} · {d.source}
                  </span>
                  {error ? (
                    <span className="field__error" id={`${id}-error`}>
                      {error.join(" ")}
                    </span>
                  ) : null}
                </div>
              );
            })}
          </div>
        </fieldset>
      ))}
      <div className="field settings-reason">
        <label className="field__label" htmlFor="settings-reason">
          Why do the thresholds change?
        </label>
        <input className="input" id="settings-reason" name="reason" aria-invalid={Boolean(errors.reason) || undefined} />
        {errors.reason ? <span className="field__error">{errors.reason.join(" ")}</span> : null}
      </div>
      <div className="form-actions">
        <Button type="submit" variant="primary" disabled={pending}>
          {pending ? "Saving…" : "Save as a new version"}
        </Button>
        <span className="muted">Version {version} stays stored; flags raised under it keep pointing at it.</span>
      </div>
    </form>
  );
}
