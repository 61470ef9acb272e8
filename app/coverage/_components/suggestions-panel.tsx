"use client";

import { useState, type FormEvent } from "react";
import { SUGGESTION_CAUTION } from "@/lib/domain/safety";
import type { AppError } from "@/lib/server/result";
import type { SuggestionSetView } from "@/lib/server/suggestions";
import { Alert } from "../../_components/alert";
import { formatDateTime, formatNumber } from "../../_components/format";
import { outcomeText } from "../../_components/labels";
import { TextField } from "../../_components/text-field";

export interface SuggestionDefaults {
  alloy: string;
  power: string;
  speed: string;
  hatch: string;
  layer: string;
  spot: string;
  k: string;
}

type Field = "n" | "seed" | "power" | "speed" | "hatch" | "layer" | "spot";

/** The safety caution of DOMAIN.md, shown where people act on suggestions. */
export function SuggestionCaution() {
  return (
    <Alert tone="warning" title="Before anyone runs these">
      {SUGGESTION_CAUTION.map((line) => (
        <p key={line}>{line.replace(/^Safety: /, "")}</p>
      ))}
    </Alert>
  );
}

/**
 * Suggested experiments for the chosen alloy inside the machine limits the user enters: a form,
 * the table of suggestions with their predicted regime and reason, and the CSV for the shop floor.
 */
export function SuggestionsPanel({ defaults, onSet }: { defaults: SuggestionDefaults | null; onSet: (set: SuggestionSetView | null) => void }) {
  const [values, setValues] = useState<Record<Field, string>>(() => ({
    n: "12",
    seed: "1",
    power: defaults?.power ?? "",
    speed: defaults?.speed ?? "",
    hatch: defaults?.hatch ?? "",
    layer: defaults?.layer ?? "",
    spot: "",
  }));
  const [error, setError] = useState<AppError | null>(null);
  const [busy, setBusy] = useState(false);
  const [set, setSet] = useState<SuggestionSetView | null>(null);

  if (!defaults) {
    return (
      <section className="panel" aria-labelledby="suggestions-title">
        <div className="panel__title">
          <h2 id="suggestions-title">Suggested experiments</h2>
        </div>
        <p className="muted">Choose one alloy in the filters: the process window the suggestions must stay inside depends on it.</p>
      </section>
    );
  }

  const change = (field: Field) => (e: { currentTarget: HTMLInputElement }) => {
    const value = e.currentTarget.value;
    setValues((v) => ({ ...v, [field]: value }));
  };
  const fieldErrors = error?.details?.fieldErrors ?? {};

  async function submit(e: FormEvent<HTMLFormElement>) {
    e.preventDefault();
    setBusy(true);
    setError(null);
    try {
      const res = await fetch("/api/coverage/suggestions", {
        method: "POST",
        headers: { "Content-Type": "application/json" },
        body: JSON.stringify({ alloy: defaults!.alloy, k: defaults!.k || undefined, ...values }),
      });
      const body = (await res.json()) as SuggestionSetView | { error: AppError };
      if ("error" in body) {
        setError(body.error);
        return;
      }
      setSet(body);
      onSet(body);
    } catch {
      setError({ code: "unavailable", message: "The server could not be reached; nothing was made." });
    } finally {
      setBusy(false);
    }
  }

  return (
    <section className="panel" aria-labelledby="suggestions-title">
      <div className="panel__title">
        <h2 id="suggestions-title">Suggested experiments for {defaults.alloy}</h2>
      </div>
      <SuggestionCaution />
      <p className="muted">
        Parameter sets that fill the thinnest cells inside the predicted process window and inside the limits you enter, spread out
        by a seeded maximin Latin hypercube, none repeating a record (P ±1 % or 2 W, v ±1 %, h and t ±1 µm). The same seed and inputs
        on the same data give the same set.
      </p>
      <form className="form-grid" onSubmit={submit} noValidate aria-label="Suggest experiments">
        <TextField className="col-3" label="Power range" name="suggest-power" value={values.power} onChange={change("power")} hint="The machine's limits, e.g. 50-400W" error={fieldErrors.power} required />
        <TextField className="col-3" label="Speed range" name="suggest-speed" value={values.speed} onChange={change("speed")} hint="e.g. 200-2000mm/s" error={fieldErrors.speed} required />
        <TextField className="col-3" label="Hatch values" name="suggest-hatch" value={values.hatch} onChange={change("hatch")} hint="What it can run: 80, 100, 120um" error={fieldErrors.hatch} required />
        <TextField className="col-3" label="Layer values" name="suggest-layer" value={values.layer} onChange={change("layer")} hint="e.g. 30, 40um" error={fieldErrors.layer} required />
        <TextField className="col-3" label="Spot diameter" name="suggest-spot" value={values.spot} onChange={change("spot")} hint={`1/e²; empty: median of the records${defaults.spot ? ` (${defaults.spot})` : ""}`} error={fieldErrors.spot} optional />
        <TextField className="col-2" label="How many" name="suggest-n" inputMode="numeric" value={values.n} onChange={change("n")} error={fieldErrors.n} />
        <div className="col-3 seed-field">
          <TextField label="Seed" name="suggest-seed" inputMode="numeric" value={values.seed} onChange={change("seed")} error={fieldErrors.seed} hint="Kept with the set" />
          <button type="button" className="button button--small button--ghost" onClick={() => setValues((v) => ({ ...v, seed: String(Math.floor(Math.random() * 2 ** 31)) }))}>
            New seed
          </button>
        </div>
        <div className="col-4 form-actions" style={{ marginTop: "1.4rem" }}>
          <button type="submit" className="button button--primary" disabled={busy}>
            {busy ? "Suggesting…" : "Suggest experiments"}
          </button>
        </div>
      </form>
      {error ? (
        <Alert tone="error" title="No suggestions were made">
          <p>{error.message}</p>
          {Object.entries(fieldErrors).length ? (
            <ul>
              {Object.entries(fieldErrors).map(([f, m]) => (
                <li key={f}>
                  {f}: {m.join(" ")}
                </li>
              ))}
            </ul>
          ) : null}
        </Alert>
      ) : null}
      {set ? <SuggestionTable set={set} /> : null}
    </section>
  );
}

function SuggestionTable({ set }: { set: SuggestionSetView }) {
  return (
    <div className="suggestion-set">
      <div className="suggestion-set__head">
        <p>
          <strong>Set {set.id}</strong>: {set.suggestions.length} suggestion(s) for {set.inputs.alloyName}, seed {set.seed}, spot {formatNumber(set.inputs.spotDiameterUm, 1)} µm ({set.inputs.spotBasis}),
          made {formatDateTime(set.createdAt)} from {set.inputs.data.records.toLocaleString("en-US")} records.
        </p>
        <a className="button button--primary" href={`/api/coverage/suggestions/${set.id}?format=csv`} download>
          Download CSV for the shop floor
        </a>
      </div>
      {set.notes.map((n) => (
        <Alert tone="info" key={n}>
          <p>{n}</p>
        </Alert>
      ))}
      {set.suggestions.length ? (
        <div className="table-wrap">
          <table className="table suggestion-table" aria-label="Suggested experiments">
            <thead>
              <tr>
                <th className="num">#</th>
                <th className="num">Power (W)</th>
                <th className="num">Speed (mm/s)</th>
                <th className="num">Hatch (µm)</th>
                <th className="num">Layer (µm)</th>
                <th className="num">E_v (J/mm³)</th>
                <th>Predicted regime</th>
                <th className="num">Records in its cell</th>
              </tr>
            </thead>
            {set.suggestions.map((s) => (
              <tbody key={s.index}>
                <tr>
                  <td className="num">{s.index}</td>
                  <td className="num">{s.laserPowerW}</td>
                  <td className="num">{s.scanSpeedMmPerS}</td>
                  <td className="num">{formatNumber(s.hatchSpacingUm, 1)}</td>
                  <td className="num">{formatNumber(s.layerThicknessUm, 1)}</td>
                  <td className="num">{formatNumber(s.volumetricEnergyJMm3, 1)}</td>
                  <td>{outcomeText(s.predictedRegime)}</td>
                  <td className="num">{s.cell.records}</td>
                </tr>
                <tr className="suggestion-table__why">
                  <td />
                  <td colSpan={7}>
                    {s.reason}
                    {s.criteriaPastThreshold.length ? ` Past their threshold but within the margin: ${s.criteriaPastThreshold.map((c) => c.replace(/_/g, " ")).join(", ")}.` : ""}
                  </td>
                </tr>
              </tbody>
            ))}
          </table>
        </div>
      ) : null}
    </div>
  );
}
