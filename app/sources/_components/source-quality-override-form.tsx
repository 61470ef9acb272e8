"use client";

import { useState, useTransition, type FormEvent } from "react";
import { Alert } from "../../_components/alert";
import { Button } from "../../_components/button";
import { fieldErrorsOf, type FormState } from "../../_components/form-result";
import { TextField } from "../../_components/text-field";

/** A reviewer's override of the score (0–1) with the reason, or removing it. */
export function SourceQualityOverrideForm({ sourceId, version, overridden, score, reason, action }: { sourceId: number; version: number; overridden: boolean; score: number | null; reason: string | null; action: (fd: FormData) => Promise<FormState> }) {
  const [state, setState] = useState<FormState>(null);
  const [pending, startTransition] = useTransition();
  const errors = fieldErrorsOf(state);
  function submit(e: FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const fd = new FormData(e.currentTarget);
    const submitter = (e.nativeEvent as SubmitEvent).submitter as HTMLButtonElement | null;
    if (submitter?.value === "clear") fd.set("clear", "1");
    startTransition(async () => setState(await action(fd)));
  }
  return (
    <form onSubmit={submit} className="form-section" aria-label="Override the quality score">
      <input type="hidden" name="sourceId" value={sourceId} />
      <input type="hidden" name="version" value={version} />
      {state && !Object.keys(errors).length ? (
        <Alert tone="error" title="Nothing was changed">
          <p>{state.error.message}</p>
        </Alert>
      ) : null}
      <div className="form-grid">
        <TextField className="col-12" label="Override score" name="score" hint="From 0 to 1; leave the computed score by leaving this empty." defaultValue={score === null ? "" : String(score)} inputMode="decimal" error={errors.score} />
        <TextField className="col-12" label="Reason" name="reason" hint="Required for an override: what you verified." defaultValue={reason ?? ""} error={errors.reason} />
      </div>
      <div className="form-actions">
        <Button type="submit" value="set" disabled={pending}>
          {pending ? "Saving…" : overridden ? "Change the override" : "Override the score"}
        </Button>
        {overridden ? (
          <Button type="submit" value="clear" variant="ghost" disabled={pending}>
            Remove the override
          </Button>
        ) : null}
      </div>
    </form>
  );
}
