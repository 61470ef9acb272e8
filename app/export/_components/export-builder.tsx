"use client";

import { useRouter } from "next/navigation";
import { startTransition, useActionState, useEffect, useState, type FormEvent } from "react";
import { Alert } from "../../_components/alert";
import { Button } from "../../_components/button";
import { Checkbox } from "../../_components/checkbox";
import { fieldErrorsOf, type FormState } from "../../_components/form-result";
import { Select } from "../../_components/select";
import { TextField } from "../../_components/text-field";
import { exportAction, type ExportFormState } from "../actions";
import { CountsTable } from "./counts-table";

const FEATURE_GROUPS = [
  ["process", "Process parameters"],
  ["energy", "Energy densities"],
  ["meltpool", "Melt-pool physics (Eagar–Tsai, ΔH/h_s, criteria margins)"],
  ["mixture", "Mixture properties"],
  ["composition", "Composition (wt% per element)"],
  ["provenance", "Provenance (record quality, source year)"],
] as const;

export function ExportBuilder({ alloys, sources }: { alloys: string[]; sources: { id: number; label: string }[] }) {
  const [state, action, pending] = useActionState<ExportFormState, FormData>(exportAction, null);
  const [label, setLabel] = useState("binary");
  const [balance, setBalance] = useState("none");
  const [splitKind, setSplitKind] = useState("source");
  const router = useRouter();
  // A new run belongs in the saved list below at once.
  useEffect(() => {
    if (state && "summary" in state) router.refresh();
  }, [state, router]);
  const errors = fieldErrorsOf(state && "error" in state ? (state as FormState) : null);
  const splitError = errors.split;
  // Submitting through onSubmit keeps what was typed: a form given an action is reset after it runs,
  // and a preview must leave the choices in place for the run that follows.
  const submit = (event: FormEvent<HTMLFormElement>) => {
    event.preventDefault();
    const data = new FormData(event.currentTarget, (event.nativeEvent as SubmitEvent).submitter);
    startTransition(() => action(data));
  };

  return (
    <form onSubmit={submit} className="panel" aria-labelledby="builder-title" noValidate>
      <div className="panel__title">
        <h2 id="builder-title">Build an export</h2>
      </div>
      {state && "error" in state ? (
        <Alert tone="error" title="Nothing was written">
          <p>{state.error.message}</p>
        </Alert>
      ) : null}

      <fieldset className="fieldset form-section">
        <legend>Records</legend>
        <div className="form-grid">
          <div className="col-6">
            <Checkbox name="includeUnreviewed" value="on" label="Include records awaiting review" hint="By default only accepted records are exported." />
          </div>
          <TextField className="col-3" name="minQuality" label="Minimum quality" optional inputMode="decimal" placeholder="0–1" error={errors.minQuality} />
          <div className="col-3" />
          <div className="field col-6">
            <label className="field__label" htmlFor="field-alloys">Alloys (none chosen: all)</label>
            <select className="select" id="field-alloys" name="alloys" multiple size={Math.min(6, Math.max(2, alloys.length))}>
              {alloys.map((a) => (
                <option key={a} value={a}>{a}</option>
              ))}
            </select>
          </div>
          <div className="field col-6">
            <label className="field__label" htmlFor="field-sources">Sources (none chosen: all)</label>
            <select className="select" id="field-sources" name="sources" multiple size={Math.min(6, Math.max(2, sources.length))}>
              {sources.map((s) => (
                <option key={s.id} value={s.id}>{s.label}</option>
              ))}
            </select>
          </div>
          <TextField className="col-3" name="enteredFrom" label="Entered from" type="date" optional error={errors.enteredFrom} />
          <TextField className="col-3" name="enteredTo" label="Entered to" type="date" optional error={errors.enteredTo} />
        </div>
      </fieldset>

      <fieldset className="fieldset form-section">
        <legend>Label</legend>
        <div className="form-grid">
          <Select className="col-4" name="label" label="Label scheme" value={label} onChange={(e) => setLabel(e.target.value)} options={[{ value: "binary", label: "Binary success (dense and density ≥ threshold)" }, { value: "multiclass", label: "Multi-class outcome" }, { value: "density", label: "Relative density (regression)" }]} error={errors.label} />
          {label === "binary" ? <TextField className="col-3" name="densityThreshold" label="Density threshold (%)" defaultValue="99" inputMode="decimal" error={errors.densityThreshold} /> : null}
        </div>
      </fieldset>

      <fieldset className="fieldset form-section">
        <legend>Features</legend>
        <div className="form-grid">
          {FEATURE_GROUPS.map(([value, text]) => (
            <div className="col-4" key={value}>
              <Checkbox name="features" value={value} label={text} defaultChecked />
            </div>
          ))}
        </div>
        {errors.features ? <p className="field__error">{errors.features.join(" ")}</p> : null}
      </fieldset>

      <fieldset className="fieldset form-section">
        <legend>Balancing and split</legend>
        <div className="form-grid">
          <Select className="col-4" name="balance" label="Balancing" value={balance} onChange={(e) => setBalance(e.target.value)} options={[{ value: "none", label: "None" }, { value: "weights", label: "Class weights" }, { value: "over", label: "Random over-sampling" }, { value: "under", label: "Random under-sampling" }, { value: "smote", label: "SMOTE" }, { value: "gaussian", label: "Gaussian sampling" }]} error={errors.balance} />
          {balance === "smote" ? <TextField className="col-2" name="k" label="Neighbours k" defaultValue="5" inputMode="numeric" error={errors.k} /> : null}
          {["over", "smote", "gaussian"].includes(balance) ? <TextField className="col-3" name="maxSyntheticMultiple" label="Synthetic cap (× real rows)" defaultValue="5" inputMode="decimal" error={errors.maxSyntheticMultiple} /> : null}
          <div className="col-3" />
          <Select className="col-4" name="splitKind" label="Split" value={splitKind} onChange={(e) => setSplitKind(e.target.value)} options={[{ value: "source", label: "By source: train / validation / test" }, { value: "folds", label: "k group folds by source" }]} />
          {splitKind === "source" ? (
            <>
              <TextField className="col-2" name="train" label="Train" defaultValue="0.7" inputMode="decimal" />
              <TextField className="col-2" name="validation" label="Validation" defaultValue="0.15" inputMode="decimal" />
              <TextField className="col-2" name="test" label="Test" defaultValue="0.15" inputMode="decimal" />
            </>
          ) : (
            <TextField className="col-2" name="folds" label="Folds" defaultValue="5" inputMode="numeric" />
          )}
          <TextField className="col-2" name="seed" label="Seed" defaultValue="1" inputMode="numeric" required error={errors.seed} />
          {splitError ? <p className="field__error col-12">{splitError.join(" ")}</p> : null}
          <TextField className="col-4" name="name" label="Name" optional placeholder="made from the options" error={errors.name} />
        </div>
      </fieldset>

      <div className="form-actions">
        <Button type="submit" name="intent" value="preview" disabled={pending}>
          Preview counts
        </Button>
        <Button type="submit" name="intent" value="run" variant="primary" disabled={pending}>
          {pending ? "Working…" : "Run export"}
        </Button>
      </div>

      {state && "preview" in state ? (
        <section className="form-section" aria-labelledby="preview-title">
          <h3 id="preview-title">Preview</h3>
          <p>
            {state.preview.counts.labelled} labelled record(s) from {state.preview.sources} source(s), of {state.preview.counts.records} in the collection. Nothing has been written yet.
          </p>
          <CountsTable caption="Rows per split and class (before → after balancing)" partitions={state.preview.counts.partitions} before={state.preview.counts.before} after={state.preview.counts.after} />
          <Warnings warnings={state.preview.warnings} />
        </section>
      ) : null}

      {state && "summary" in state ? (
        <section className="form-section" aria-labelledby="done-title">
          <h3 id="done-title">Export “{state.summary.name}” saved</h3>
          <CountsTable caption="Rows per split and class (before → after balancing)" partitions={state.summary.counts.partitions} before={state.summary.counts.before} after={state.summary.counts.after} />
          <DownloadList name={state.summary.name} files={state.summary.files} />
          <Warnings warnings={state.summary.warnings} />
        </section>
      ) : null}
    </form>
  );
}

function Warnings({ warnings }: { warnings: string[] }) {
  if (!warnings.length) return null;
  return (
    <Alert tone="warning" title={`${warnings.length} warning(s)`}>
      <ul>
        {warnings.map((w, i) => (
          <li key={i}>{w}</li>
        ))}
      </ul>
    </Alert>
  );
}

export function DownloadList({ name, files }: { name: string; files: { name: string; rows?: number | null; sha256: string }[] }) {
  return (
    <ul className="export-downloads" aria-label={`Files of ${name}`}>
      {files.map((f) => (
        <li key={f.name}>
          <a href={`/api/exports/${encodeURIComponent(name)}/${encodeURIComponent(f.name)}`} download>
            {f.name}
          </a>
          {typeof f.rows === "number" ? <span className="muted"> · {f.rows} rows</span> : null}
          <code className="muted"> {f.sha256.slice(0, 12)}…</code>
        </li>
      ))}
    </ul>
  );
}
