"use client";

import Link from "next/link";
import { useRef, useState, useTransition, type FormEvent } from "react";
import { DENSITY_METHOD_LABEL, DENSITY_METHODS, OUTCOME_EVIDENCE, OUTCOME_EVIDENCE_LABEL, SOURCE_KIND_LABEL, SOURCE_KINDS, SPOT_DEFINITION_LABEL, SPOT_DEFINITIONS, sourceInputSchema, sourceUpdateSchema } from "@/lib/schemas/source";
import { fieldErrorsOf as fieldErrorsOfIssues } from "@/lib/schemas/issues";
import { Button } from "../../_components/button";
import { Checkbox } from "../../_components/checkbox";
import { fieldErrorsOf, type FormState } from "../../_components/form-result";
import { Select } from "../../_components/select";
import { TextAreaField, TextField } from "../../_components/text-field";
import { useFocusOnError } from "../../_components/use-focus-on-error";
import { sourceInputFromFormData } from "../_lib/source-form-data";

export interface SourceFormValues {
  kind: string;
  title: string;
  authors: string[];
  year: number | null;
  venue: string | null;
  doi: string | null;
  url: string | null;
  notes: string | null;
  densityMethod: string;
  outcomeEvidence: string;
  machineStated: boolean;
  spotSizeDefinition: string | null;
  powderReported: boolean;
  atmosphereReported: boolean;
}

const options = <K extends string>(ids: readonly K[], labels: Record<K, string>) => ids.map((id) => ({ value: id, label: labels[id] }));
const spotOptions = SPOT_DEFINITIONS.filter((d) => d !== "unstated").map((d) => ({ value: d, label: SPOT_DEFINITION_LABEL[d] }));

/**
 * Create or edit a source. Validates with the same schema as the server before sending; the
 * server's answer (field messages, a duplicate, a version conflict) is shown without losing input.
 */
export function SourceForm({ action, initial, id, version, submitLabel }: { action: (fd: FormData) => Promise<FormState>; initial?: SourceFormValues; id?: number; version?: number; submitLabel: string }) {
  const formRef = useRef<HTMLFormElement>(null);
  const alertRef = useRef<HTMLDivElement>(null);
  const [state, setState] = useState<FormState>(null);
  const [attempt, setAttempt] = useState(0);
  const [pending, startTransition] = useTransition();
  const editing = id !== undefined;
  const errors = fieldErrorsOf(state);
  const isConflict = state?.error.code === "conflict";
  const sameTitle = isConflict && Boolean(errors.title) && !errors.doi;
  useFocusOnError(formRef, alertRef, attempt, Boolean(state && (isConflict || !Object.keys(errors).length)));

  function onSubmit(e: FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const fd = new FormData(e.currentTarget);
    const checked = (editing ? sourceUpdateSchema : sourceInputSchema).safeParse(sourceInputFromFormData(fd));
    if (!checked.success) {
      setState({ error: { code: "invalid_input", message: "Some fields need attention.", details: { fieldErrors: fieldErrorsOfIssues(checked.error) } } });
      setAttempt((n) => n + 1);
      return;
    }
    startTransition(async () => {
      const result = await action(fd);
      setState(result);
      setAttempt((n) => n + 1);
    });
  }

  const v = initial;
  return (
    <form ref={formRef} onSubmit={onSubmit} noValidate aria-describedby={state ? "source-form-message" : undefined}>
      {state ? (
        <div ref={alertRef} tabIndex={-1} id="source-form-message" className={`alert ${isConflict ? "alert--warning" : "alert--error"}`} role="alert">
          <p className="alert__title">{isConflict ? "Not saved: this would clash with what is stored" : "Not saved"}</p>
          <p>{state.error.message}</p>
          {state.error.details?.existingSourceId ? (
            <p>
              <Link href={`/sources/${state.error.details.existingSourceId}`}>Open source {state.error.details.existingSourceId}</Link>
            </p>
          ) : null}
          {editing && isConflict && state.error.details?.currentVersion ? (
            <p>
              <a href={`/sources/${id}`}>Reload this source</a> to see the saved version; your text stays in the form until you do.
            </p>
          ) : null}
        </div>
      ) : null}

      {editing ? (
        <>
          <input type="hidden" name="id" value={id} />
          <input type="hidden" name="version" value={version} />
        </>
      ) : null}

      <div className="form-grid">
        <Select className="col-4" label="Kind" name="kind" options={options(SOURCE_KINDS, SOURCE_KIND_LABEL)} placeholder="Choose…" defaultValue={v?.kind ?? ""} error={errors.kind} required />
        <TextField className="col-2" label="Year" name="year" inputMode="numeric" defaultValue={v?.year ?? ""} error={errors.year} autoComplete="off" />
        <TextField className="col-6" label="DOI" name="doi" optional defaultValue={v?.doi ?? ""} error={errors.doi} hint="10.NNNN/… — a resolver address in front is fine" autoComplete="off" spellCheck={false} />
        <TextField className="col-12" label="Title" name="title" defaultValue={v?.title ?? ""} error={errors.title} required autoComplete="off" />
        <TextAreaField className="col-6" label="Authors" name="authors" optional rows={3} defaultValue={v?.authors.join("\n") ?? ""} error={errors.authors} hint="One per line, or separated by semicolons" />
        <div className="col-6" style={{ display: "grid", gap: "1rem" }}>
          <TextField label="Venue" name="venue" optional defaultValue={v?.venue ?? ""} error={errors.venue} hint="Journal, conference, institution or site" />
          <TextField label="Web address" name="url" optional type="url" defaultValue={v?.url ?? ""} error={errors.url} spellCheck={false} />
        </div>
      </div>

      <fieldset className="fieldset" style={{ marginTop: "1.5rem" }}>
        <legend>What the source reports</legend>
        <div className="form-grid">
          <Select className="col-4" label="Density method" name="densityMethod" options={options(DENSITY_METHODS, DENSITY_METHOD_LABEL)} defaultValue={v?.densityMethod ?? "unknown"} error={errors.densityMethod} />
          <Select className="col-4" label="Outcome evidence" name="outcomeEvidence" options={options(OUTCOME_EVIDENCE, OUTCOME_EVIDENCE_LABEL)} defaultValue={v?.outcomeEvidence ?? "statement_only"} error={errors.outcomeEvidence} />
          <Select className="col-4" label="Spot size definition" name="spotSizeDefinition" options={spotOptions} placeholder="Not stated" defaultValue={v?.spotSizeDefinition ?? ""} error={errors.spotSizeDefinition} />
          <div className="col-12" style={{ display: "flex", gap: "1.5rem", flexWrap: "wrap" }}>
            <Checkbox label="Machine stated" name="machineStated" defaultChecked={v?.machineStated ?? false} />
            <Checkbox label="Powder size reported" name="powderReported" defaultChecked={v?.powderReported ?? false} />
            <Checkbox label="Atmosphere reported" name="atmosphereReported" defaultChecked={v?.atmosphereReported ?? false} />
          </div>
          <TextAreaField className="col-12" label="Notes" name="notes" optional rows={3} defaultValue={v?.notes ?? ""} error={errors.notes} />
        </div>
      </fieldset>

      {sameTitle ? (
        <div style={{ marginTop: "1rem" }}>
          <Checkbox label="This is a different work with the same title and year: create it anyway" name="allowSameTitle" />
        </div>
      ) : null}

      <div className="form-actions">
        <Button type="submit" variant="primary" disabled={pending}>
          {pending ? "Saving…" : submitLabel}
        </Button>
        {pending ? <span className="muted" role="status">Saving…</span> : null}
      </div>
    </form>
  );
}
