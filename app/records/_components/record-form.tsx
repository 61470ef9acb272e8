"use client";

import Link from "next/link";
import { useEffect, useMemo, useRef, useState, useTransition, type FocusEvent, type FormEvent } from "react";
import { resolveAlloy, listGrades } from "@/lib/domain/alloys";
import { parseComposition } from "@/lib/domain/composition";
import { energyDensities } from "@/lib/domain/energy-density";
import { OUTCOMES, outcomeLabel } from "@/lib/domain/outcomes";
import { toOneOverE2Diameter } from "@/lib/domain/spot-definition";
import { CANONICAL_UNIT, PLAUSIBLE_RANGES, parseQuantity, unitOptions, type Quantity } from "@/lib/domain/units";
import { fieldErrorsOf as fieldErrorsOfIssues } from "@/lib/schemas/issues";
import { RECORD_QUANTITY_FIELDS, RECORD_SPOT_DEFINITIONS, recordInputSchema, recordUpdateSchema, type Provenance, type RecordQuantityField } from "@/lib/schemas/record";
import { Button } from "../../_components/button";
import { Checkbox } from "../../_components/checkbox";
import { formatNumber, formatSignificant } from "../../_components/format";
import type { FormState } from "../../_components/form-result";
import { QuantityField } from "../../_components/quantity-field";
import { Select } from "../../_components/select";
import { TextField } from "../../_components/text-field";
import { useFocusOnError } from "../../_components/use-focus-on-error";
import { recordInputOf, type RecordFormValues } from "../_lib/record-form-values";

export interface RecordFormProps {
  mode: "create" | "edit";
  initial: RecordFormValues;
  sources: readonly { id: number; label: string }[];
  /** Edit only: the record and the version the editor opened. */
  recordId?: number;
  version?: number;
  action: (input: unknown) => Promise<FormState>;
  autoFocusFirst?: boolean;
  /** The page shown in the paper pane beside the form; it fills the record's page. */
  pageInView?: number | null;
}

const QUANTITY_LABEL: Record<RecordQuantityField, string> = {
  laserPower: "Laser power",
  scanSpeed: "Scan speed",
  hatchSpacing: "Hatch spacing",
  layerThickness: "Layer thickness",
  spotDiameter: "Spot diameter",
  preheat: "Preheat",
  powderD10: "Powder D10",
  powderD50: "Powder D50",
  powderD90: "Powder D90",
  relativeDensity: "Relative density",
};

const PROVENANCE_LABEL: Record<Provenance, string> = { reported: "Reported", derived: "Derived", assumed: "Assumed default" };
const PROVENANCE_OPTIONS = (Object.keys(PROVENANCE_LABEL) as Provenance[]).map((p) => ({ value: p, label: PROVENANCE_LABEL[p] }));

const SPOT_LABEL: Record<(typeof RECORD_SPOT_DEFINITIONS)[number], string> = { one_over_e2: "1/e² diameter", d4sigma: "D4σ (second moment)", fwhm: "FWHM" };
const SPOT_OPTIONS = RECORD_SPOT_DEFINITIONS.map((d) => ({ value: d, label: SPOT_LABEL[d] }));

const OUTCOME_OPTIONS = OUTCOMES.map((o) => ({ value: o, label: outcomeLabel(o) }));
const STATUS_OPTIONS = [
  { value: "needs_review", label: "Ready for review" },
  { value: "draft", label: "Draft (not finished)" },
];
const GRADES = listGrades();

/** Typical volumetric energy density of LPBF (common practice, from memory; DOMAIN.md). */
const EV_TYPICAL_J_MM3 = { min: 10, max: 300 };

type Parsed = { ok: true; value: number } | { ok: false } | null;

function parseField(q: { value: string; unit: string }, quantity: Quantity): Parsed {
  if (q.value.trim() === "") return null;
  const p = parseQuantity(q.unit ? `${q.value} ${q.unit}` : q.value, quantity);
  return p.ok ? { ok: true, value: p.value } : { ok: false };
}

const valueOf = (p: Parsed) => (p && p.ok ? p.value : null);

/**
 * Keying in or editing one build record. Messages come from the same schema the server uses;
 * canonical values and energy densities update while typing; a version conflict keeps the input.
 */
export function RecordForm({ mode, initial, sources, recordId, version, action, autoFocusFirst, pageInView }: RecordFormProps) {
  const formRef = useRef<HTMLFormElement>(null);
  const alertRef = useRef<HTMLDivElement>(null);
  const [values, setValues] = useState<RecordFormValues>(initial);
  const [touched, setTouched] = useState<ReadonlySet<string>>(new Set());
  const [submitted, setSubmitted] = useState(false);
  const [serverState, setServerState] = useState<FormState>(null);
  const [serverErrors, setServerErrors] = useState<Record<string, string[]>>({});
  const [attempt, setAttempt] = useState(0);
  const [pending, startTransition] = useTransition();
  useEffect(() => {
    if (pageInView) setValues((v) => (v.locationPage === String(pageInView) ? v : { ...v, locationPage: String(pageInView) }));
  }, [pageInView]);

  const input = useMemo(() => recordInputOf(values), [values]);
  const schema = mode === "edit" ? recordUpdateSchema : recordInputSchema;
  const clientErrors = useMemo(() => {
    const checked = schema.safeParse(mode === "edit" ? { ...input, id: recordId, version, reason: values.reason } : input);
    const errors = checked.success ? {} : fieldErrorsOfIssues(checked.error);
    if (values.useMeasuredComposition && values.composition.trim() !== "") {
      const parsed = parseComposition(values.composition);
      if (!parsed.ok) errors.composition = [parsed.message];
    } else if (values.useMeasuredComposition) {
      errors.composition = ["Enter the measured composition, e.g. Fe bal, Cr 17.2, Ni 12.1, Mo 2.4 — or untick the box to use the nominal one."];
    }
    return errors;
  }, [schema, mode, input, recordId, version, values.reason, values.useMeasuredComposition, values.composition]);

  const parsed = useMemo(() => {
    const out = {} as Record<RecordQuantityField, Parsed>;
    for (const f of Object.keys(RECORD_QUANTITY_FIELDS) as RecordQuantityField[]) out[f] = parseField(values.quantities[f], RECORD_QUANTITY_FIELDS[f]);
    return out;
  }, [values.quantities]);

  const spotOneOverE2 = useMemo(() => {
    const d = valueOf(parsed.spotDiameter);
    if (d === null || d <= 0) return null;
    return toOneOverE2Diameter(d, (values.spotDefinition || "one_over_e2") as (typeof RECORD_SPOT_DEFINITIONS)[number]);
  }, [parsed.spotDiameter, values.spotDefinition]);

  const energy = energyDensities({
    laserPowerW: valueOf(parsed.laserPower),
    scanSpeedMmPerS: valueOf(parsed.scanSpeed),
    hatchSpacingUm: valueOf(parsed.hatchSpacing),
    layerThicknessUm: valueOf(parsed.layerThickness),
  });

  const isConflict = serverState?.error.code === "conflict";
  useFocusOnError(formRef, alertRef, attempt, Boolean(serverState && (isConflict || !Object.keys(serverState.error.details?.fieldErrors ?? {}).length)));

  /** Messages of a field (its key as the schema names it), once the user has left it or submitted. */
  function errorsFor(key: string): string[] | undefined {
    const base = key.split(".")[0] ?? key;
    const client = submitted || touched.has(base) ? clientErrors[key] : undefined;
    return client ?? serverErrors[key];
  }

  function update(patch: Partial<RecordFormValues>, keys: string[]) {
    setValues((v) => ({ ...v, ...patch }));
    clearServerErrors(keys);
  }

  function updateQuantity(field: RecordQuantityField, patch: Partial<RecordFormValues["quantities"][RecordQuantityField]>) {
    setValues((v) => ({ ...v, quantities: { ...v.quantities, [field]: { ...v.quantities[field], ...patch } } }));
    clearServerErrors([`${field}.value`, field]);
  }

  function clearServerErrors(keys: string[]) {
    setServerErrors((e) => {
      if (!keys.some((k) => k in e)) return e;
      const next = { ...e };
      for (const k of keys) delete next[k];
      return next;
    });
  }

  function onBlur(e: FocusEvent<HTMLFormElement>) {
    const target = e.target as EventTarget;
    const name = target instanceof HTMLInputElement || target instanceof HTMLSelectElement || target instanceof HTMLTextAreaElement ? target.name : "";
    if (!name) return;
    const base = name.split(".")[0] ?? name;
    setTouched((t) => (t.has(base) ? t : new Set(t).add(base)));
  }

  function onSubmit(e: FormEvent<HTMLFormElement>) {
    e.preventDefault();
    setSubmitted(true);
    if (Object.keys(clientErrors).length) {
      setServerState(null);
      setAttempt((n) => n + 1);
      return;
    }
    const payload = mode === "edit" ? { ...input, id: recordId, version, reason: values.reason } : input;
    startTransition(async () => {
      const result = await action(payload);
      setServerState(result);
      setServerErrors(result?.error.details?.fieldErrors ?? {});
      setAttempt((n) => n + 1);
    });
  }

  const alloyInfo = useMemo(() => (values.alloy.trim() ? resolveAlloy(values.alloy) : null), [values.alloy]);
  const problemCount = Object.keys(clientErrors).length;
  const sourceOptions = sources.map((s) => ({ value: String(s.id), label: s.label }));

  function quantity(field: RecordQuantityField, opts: { required?: boolean; className?: string; extraHint?: string } = {}) {
    const q = values.quantities[field];
    const quantityKind = RECORD_QUANTITY_FIELDS[field];
    const units = unitOptions(quantityKind);
    const unitChoices = units.some((u) => u.id === q.unit) || q.unit === "" ? units : [...units, { id: q.unit, label: q.unit }];
    const p = parsed[field];
    let canonical: string | undefined;
    let warning: string | undefined;
    if (p && p.ok) {
      const unit = CANONICAL_UNIT[quantityKind];
      canonical = field === "spotDiameter" && spotOneOverE2 !== null && values.spotDefinition === "fwhm" ? `= ${formatSignificant(spotOneOverE2, 4)} ${unit} as a 1/e² diameter` : `= ${formatNumber(p.value, 4)} ${unit}`;
      const range = PLAUSIBLE_RANGES[quantityKind];
      if (field === "relativeDensity" && p.value > 100 && p.value <= 101) warning = "Above 100 %: the reference density may be off.";
      else if (p.value < range.min || p.value > range.max) warning = `Outside the usual ${formatNumber(range.min)}–${formatNumber(range.max)} ${unit}: check the value and its unit.`;
    }
    const hints = [opts.extraHint, warning].filter(Boolean).join(" ");
    const provenanceId = `field-${field}-provenance`;
    return (
      <div className={opts.className} key={field}>
        <QuantityField
          label={QUANTITY_LABEL[field]}
          name={field}
          value={q.value}
          unit={q.unit}
          units={unitChoices}
          onValueChange={(value) => updateQuantity(field, { value })}
          onUnitChange={(unit) => updateQuantity(field, { unit })}
          canonical={canonical}
          hint={hints || undefined}
          error={errorsFor(`${field}.value`) ?? errorsFor(field)}
          optional={!opts.required}
          required={opts.required}
          aside={
        <span className="field__aside">
          <label htmlFor={provenanceId} className="field__hint">
            Provenance
          </label>
          <select
            id={provenanceId}
            name={`${field}.provenance`}
            className="select"
            style={{ width: "auto", minHeight: "1.85rem", padding: "0.1rem 1.7rem 0.1rem 0.4rem", fontSize: "0.86rem" }}
            value={q.provenance}
            onChange={(e) => updateQuantity(field, { provenance: e.target.value as Provenance })}
          >
            {PROVENANCE_OPTIONS.map((o) => (
              <option key={o.value} value={o.value}>
                {o.label}
              </option>
            ))}
          </select>
        </span>
          }
        />
      </div>
    );
  }

  const d10 = valueOf(parsed.powderD10);
  const d50 = valueOf(parsed.powderD50);
  const d90 = valueOf(parsed.powderD90);
  const powderOrderWarning = (d10 !== null && d50 !== null && d10 > d50) || (d50 !== null && d90 !== null && d50 > d90) || (d10 !== null && d90 !== null && d10 > d90);

  return (
    <form ref={formRef} className="record-form" onSubmit={onSubmit} onBlur={onBlur} noValidate>
      <div>
        {serverState ? (
          <div ref={alertRef} tabIndex={-1} className={`alert ${isConflict ? "alert--warning" : "alert--error"}`} role="alert">
            {isConflict && mode === "edit" ? (
              <>
                <p className="alert__title">Someone saved this record after you opened it</p>
                <p>{serverState.error.message}</p>
                <p>
                  Everything you typed is still in the form. <a href={`/records/${recordId}`} target="_blank" rel="noreferrer">Open the saved version in a new tab</a> to compare.
                </p>
              </>
            ) : (
              <>
                <p className="alert__title">Not saved</p>
                <p>{serverState.error.message}</p>
              </>
            )}
          </div>
        ) : submitted && problemCount > 0 ? (
          <div ref={alertRef} tabIndex={-1} className="alert alert--error" role="alert">
            <p className="alert__title">Not saved: {problemCount === 1 ? "one field needs" : `${problemCount} fields need`} attention</p>
            <p>The messages are under the fields.</p>
          </div>
        ) : null}

        <section className="panel form-section" aria-labelledby="sec-source">
          <h2 id="sec-source" className="panel__title">
            Source and location
          </h2>
          <div className="form-grid">
            <Select
              className="col-6"
              label="Source"
              name="sourceId"
              options={sourceOptions}
              placeholder={sources.length ? "Choose the source…" : "No sources yet: add one first"}
              value={values.sourceId}
              onChange={(e) => update({ sourceId: e.target.value }, ["sourceId"])}
              error={errorsFor("sourceId")}
              required
              autoFocus={autoFocusFirst && !values.sourceId}
              hint={
                <>
                  Not in the list? <Link href="/sources/new">Add a source</Link> first.
                </>
              }
            />
            <TextField className="col-2" label="Page" name="locationPage" optional inputMode="numeric" autoComplete="off" value={values.locationPage} onChange={(e) => update({ locationPage: e.target.value }, ["locationPage"])} error={errorsFor("locationPage")} autoFocus={autoFocusFirst && Boolean(values.sourceId)} />
            <TextField className="col-4" label="Table, figure or section" name="locationLabel" optional autoComplete="off" placeholder="Table 2, Fig. 4b" value={values.locationLabel} onChange={(e) => update({ locationLabel: e.target.value }, ["locationLabel"])} error={errorsFor("locationLabel")} />
          </div>
        </section>

        <section className="panel form-section" aria-labelledby="sec-material">
          <h2 id="sec-material" className="panel__title">
            Material and machine
          </h2>
          <div className="form-grid">
            <TextField
              className="col-6"
              label="Alloy"
              name="alloy"
              list="alloy-grades"
              autoComplete="off"
              spellCheck={false}
              required
              value={values.alloy}
              onChange={(e) => update({ alloy: e.target.value }, ["alloy"])}
              error={errorsFor("alloy")}
              hint={alloyHint(alloyInfo, values.useMeasuredComposition)}
            />
            <datalist id="alloy-grades">
              {GRADES.map((g) => (
                <option key={g.key} value={g.key}>
                  {g.displayName}
                </option>
              ))}
            </datalist>
            <TextField className="col-6" label="Machine" name="machine" optional autoComplete="off" value={values.machine} onChange={(e) => update({ machine: e.target.value }, ["machine"])} error={errorsFor("machine")} />
            <div className="col-12">
              <Checkbox
                label="The source gives a measured composition"
                name="useMeasuredComposition"
                checked={values.useMeasuredComposition}
                onChange={(e) => update({ useMeasuredComposition: e.target.checked }, ["composition"])}
              />
            </div>
            {values.useMeasuredComposition ? (
              <TextField
                className="col-12"
                label="Measured composition"
                name="composition"
                autoComplete="off"
                spellCheck={false}
                placeholder="Fe bal, Cr 17.2, Ni 12.1, Mo 2.4"
                value={values.composition}
                onChange={(e) => update({ composition: e.target.value }, ["composition"])}
                error={errorsFor("composition")}
                hint="wt% unless every amount says at%; one element may be 'bal'. Used instead of the grade's nominal composition."
              />
            ) : null}
          </div>
        </section>

        <section className="panel form-section" aria-labelledby="sec-process">
          <h2 id="sec-process" className="panel__title">
            Process parameters
          </h2>
          <div className="form-grid">
            {quantity("laserPower", { required: true, className: "col-6" })}
            {quantity("scanSpeed", { required: true, className: "col-6" })}
            {quantity("hatchSpacing", { className: "col-6" })}
            {quantity("layerThickness", { className: "col-6" })}
            {quantity("spotDiameter", { className: "col-6" })}
            <Select
              className="col-6"
              label="Spot diameter definition"
              name="spotDefinition"
              options={SPOT_OPTIONS}
              value={values.spotDefinition}
              onChange={(e) => update({ spotDefinition: e.target.value }, ["spotDefinition"])}
              error={errorsFor("spotDefinition")}
              hint="As the source defines it; stored as the 1/e² diameter (FWHM × 1.699 for a Gaussian beam)."
            />
            {quantity("preheat", { className: "col-6" })}
            <div className="col-6" />
            <TextField className="col-6" label="Atmosphere" name="atmosphere" optional autoComplete="off" placeholder="Argon, N₂" value={values.atmosphere} onChange={(e) => update({ atmosphere: e.target.value }, ["atmosphere"])} error={errorsFor("atmosphere")} />
            <TextField className="col-6" label="Scan strategy" name="scanStrategy" optional autoComplete="off" placeholder="Stripes, 67° rotation" value={values.scanStrategy} onChange={(e) => update({ scanStrategy: e.target.value }, ["scanStrategy"])} error={errorsFor("scanStrategy")} />
          </div>
        </section>

        <section className="panel form-section" aria-labelledby="sec-powder">
          <h2 id="sec-powder" className="panel__title">
            Powder
          </h2>
          <div className="form-grid">
            {quantity("powderD10", { className: "col-4" })}
            {quantity("powderD50", { className: "col-4" })}
            {quantity("powderD90", { className: "col-4" })}
          </div>
          {powderOrderWarning ? (
            <p className="alert alert--warning" style={{ marginTop: "0.75rem", marginBottom: 0 }} role="status">
              The sizes should rise from D10 to D50 to D90: check the order and the units.
            </p>
          ) : null}
        </section>

        <section className="panel form-section" aria-labelledby="sec-outcome">
          <h2 id="sec-outcome" className="panel__title">
            Outcome and density
          </h2>
          <div className="form-grid">
            <Select className="col-6" label="Outcome" name="outcome" options={OUTCOME_OPTIONS} value={values.outcome} onChange={(e) => update({ outcome: e.target.value }, ["outcome"])} error={errorsFor("outcome")} hint="Unknown when the source does not say." />
            {quantity("relativeDensity", { className: "col-6" })}
            <TextField className="col-12" label="Outcome as written in the source" name="outcomeText" optional autoComplete="off" placeholder="e.g. “near fully dense, few LOF pores”" value={values.outcomeText} onChange={(e) => update({ outcomeText: e.target.value }, ["outcomeText"])} error={errorsFor("outcomeText")} />
            <Select className="col-6" label="Save as" name="status" options={STATUS_OPTIONS} value={values.status} onChange={(e) => update({ status: e.target.value as RecordFormValues["status"] }, ["status"])} error={errorsFor("status")} />
            {mode === "edit" ? (
              <TextField className="col-6" label="Reason for the change" name="reason" optional autoComplete="off" value={values.reason} onChange={(e) => update({ reason: e.target.value }, ["reason"])} error={errorsFor("reason")} hint="Kept in the history, e.g. “power re-read from Table 2”." />
            ) : null}
          </div>
          <div className="form-actions">
            <Button type="submit" variant="primary" disabled={pending}>
              {pending ? "Saving…" : mode === "edit" ? "Save changes" : "Save record"}
            </Button>
            <Link href={mode === "edit" ? `/records/${recordId}` : "/records"} className="button button--ghost">
              Cancel
            </Link>
            <span className="muted" role="status" style={{ fontSize: "0.9rem" }}>
              {pending ? "Saving…" : "Enter saves from any field."}
            </span>
          </div>
        </section>
      </div>

      <aside className="panel derived-panel" aria-labelledby="derived-title">
        <h2 id="derived-title" className="panel__title">
          Derived while you type
        </h2>
        <div aria-live="polite">
          <Derived name="Linear energy E_l" formula="P / v" value={energy.linearJPerMm} unit="J/mm" />
          <Derived name="Areal energy E_a" formula="P / (v·h)" value={energy.arealJPerMm2} unit="J/mm²" />
          <Derived name="Volumetric energy E_v" formula="P / (v·h·t)" value={energy.volumetricJPerMm3} unit="J/mm³" />
        </div>
        {energy.volumetricJPerMm3 !== null && (energy.volumetricJPerMm3 < EV_TYPICAL_J_MM3.min || energy.volumetricJPerMm3 > EV_TYPICAL_J_MM3.max) ? (
          <p className="field__hint" style={{ marginTop: "0.5rem" }}>
            E_v is outside the usual {EV_TYPICAL_J_MM3.min}–{EV_TYPICAL_J_MM3.max} J/mm³: check the units of P, v, h and t.
          </p>
        ) : null}
        <p className="field__hint" style={{ marginTop: "0.75rem", marginBottom: 0 }}>
          {missingFor(energy, parsed)}
        </p>
      </aside>
    </form>
  );
}

function Derived({ name, formula, value, unit }: { name: string; formula: string; value: number | null; unit: string }) {
  return (
    <div className="derived-value">
      <span className="derived-value__name">
        {name} <span className="mono">= {formula}</span>
      </span>
      <span className="derived-value__number">
        {value === null ? "—" : formatSignificant(value, 3)} <span className="muted" style={{ fontSize: "0.85rem", fontWeight: 400 }}>{unit}</span>
      </span>
    </div>
  );
}

function missingFor(energy: ReturnType<typeof energyDensities>, parsed: Record<RecordQuantityField, Parsed>): string {
  if (energy.volumetricJPerMm3 !== null) return "From the values in canonical units: P in W, v in mm/s, h and t in mm.";
  const missing = (["laserPower", "scanSpeed", "hatchSpacing", "layerThickness"] as const).filter((f) => valueOf(parsed[f]) === null).map((f) => QUANTITY_LABEL[f].toLowerCase());
  return `Needs ${missing.join(", ")}.`;
}

function alloyHint(info: ReturnType<typeof resolveAlloy> | null, measured: boolean): string {
  if (!info) return "A grade (316L, IN718, Ti-6Al-4V…) or a designation such as Fe-18Cr-8Ni.";
  if (!info.ok) return measured ? "Not a grade in the library: the measured composition below is used." : "Not a grade in the library and not a readable designation: it is kept as written, without a composition.";
  const comp = info.components
    .slice(0, 5)
    .map((c) => (c.isBalance ? `${c.element} bal` : `${c.element} ${formatNumber(c.amount, 3)}`))
    .join(", ");
  const more = info.components.length > 5 ? ", …" : "";
  const basis = measured ? "Grade recognized; the measured composition below replaces the nominal one." : `Nominal composition${info.standard ? ` (${info.standard})` : ""}: ${comp}${more} wt%.`;
  return `${info.displayName}. ${basis}`;
}
