"use client";

import { useCallback, useMemo, useState, type FormEvent } from "react";
import { DEFAULT_COVERAGE_STATUSES } from "@/lib/schemas/coverage";
import { RECORD_STATUSES } from "@/lib/schemas/record";
import type { CoverageReport } from "@/lib/server/coverage";
import type { AppError } from "@/lib/server/result";
import type { SuggestionSetView } from "@/lib/server/suggestions";
import { Alert } from "../../_components/alert";
import { Checkbox } from "../../_components/checkbox";
import { EmptyState } from "../../_components/empty-state";
import { formatNumber } from "../../_components/format";
import { outcomeText, statusLabel } from "../../_components/labels";
import { outcomeColour } from "../../_components/palette";
import { Select } from "../../_components/select";
import { TextField } from "../../_components/text-field";
import { filtersFromParams, queryStringOf, type CoverageFilters, type CoverageParam } from "../_lib/coverage-url";
import { BAR_FILL } from "./chart-palette";
import { buildBars, buildGrid, buildHistogram, buildScatter, ChartFigure } from "./coverage-charts";
import { SuggestionsPanel, type SuggestionDefaults } from "./suggestions-panel";

const SCALE_OPTIONS = [
  { value: "auto", label: "Auto (log when it spans a decade)" },
  { value: "linear", label: "Linear" },
  { value: "log", label: "Logarithmic" },
];

function pct(x: number | null | undefined): string {
  return x === null || x === undefined ? "—" : `${formatNumber(100 * x, 0)} %`;
}

function slug(text: string): string {
  return text.replace(/[^A-Za-z0-9]+/g, "-").replace(/^-|-$/g, "").toLowerCase() || "all";
}

/** The suggestion form starts from the view: its alloy, the grid's range and the window's plane. */
function suggestionDefaults(r: CoverageReport | null): SuggestionDefaults | null {
  if (!r || !r.query.alloy) return null;
  const edge = (x: number | undefined) => (x === undefined ? "" : String(Number(x.toPrecision(4))));
  const w = r.window;
  return {
    alloy: r.query.alloy,
    power: r.powerEdgesW.length ? `${edge(r.powerEdgesW[0])}-${edge(r.powerEdgesW.at(-1))}W` : "",
    speed: r.speedEdgesMmPerS.length ? `${edge(r.speedEdgesMmPerS[0])}-${edge(r.speedEdgesMmPerS.at(-1))}mm/s` : "",
    hatch: w ? `${formatNumber(w.hatchSpacingUm, 1)}um` : "",
    layer: w ? `${formatNumber(w.layerThicknessUm, 1)}um` : "",
    spot: w ? `${formatNumber(w.spotDiameterUm, 1)} µm` : "",
    k: String(r.query.k),
  };
}

const BASIS_WORDS: Record<string, string> = { chosen: "as chosen", filter: "middle of the filter", "median of the selection": "median of the selection", default: "default" };

/**
 * The coverage page: filters on the left, the charts and tables of the report on the right, the
 * suggestions below. Filters go to the API and into the address bar, so a view can be shared.
 */
export function CoverageView({ alloys, initialFilters, initialReport, initialError }: { alloys: string[]; initialFilters: CoverageFilters; initialReport: CoverageReport | null; initialError: AppError | null }) {
  const [filters, setFilters] = useState<CoverageFilters>(initialFilters);
  const [report, setReport] = useState<CoverageReport | null>(initialReport);
  const [error, setError] = useState<AppError | null>(initialError);
  const [loading, setLoading] = useState(false);
  const [set, setSet] = useState<SuggestionSetView | null>(null);

  const statuses = filters.status ? filters.status.split(",") : [...DEFAULT_COVERAGE_STATUSES];
  const fieldErrors = error?.details?.fieldErrors ?? {};
  const text = (param: CoverageParam) => ({
    name: param,
    value: filters[param],
    onChange: (e: { currentTarget: HTMLInputElement | HTMLSelectElement }) => {
      const value = e.currentTarget.value;
      setFilters((f) => ({ ...f, [param]: value }));
    },
    error: fieldErrors[param],
  });

  async function apply(next: CoverageFilters) {
    setLoading(true);
    const qs = queryStringOf(next);
    try {
      const res = await fetch(`/api/coverage${qs ? `?${qs}` : ""}`);
      const body = (await res.json()) as CoverageReport | { error: AppError };
      if ("error" in body) {
        setError(body.error);
        return;
      }
      setError(null);
      setReport(body);
      setSet(null);
      window.history.replaceState(null, "", `/coverage${qs ? `?${qs}` : ""}`);
    } catch {
      setError({ code: "unavailable", message: "The server could not be reached; the view was not updated." });
    } finally {
      setLoading(false);
    }
  }

  function submit(e: FormEvent<HTMLFormElement>) {
    e.preventDefault();
    void apply(filters);
  }

  function toggleStatus(status: string, checked: boolean) {
    const next = checked ? [...new Set([...statuses, status])] : statuses.filter((s) => s !== status);
    setFilters((f) => ({ ...f, status: RECORD_STATUSES.filter((s) => next.includes(s)).join(",") }));
  }

  function reset() {
    const cleared = filtersFromParams({});
    setFilters(cleared);
    void apply(cleared);
  }

  const suggestions = useMemo(() => set?.suggestions ?? [], [set]);
  const name = slug(report?.query.alloy ?? "all-alloys");
  const scatter = useCallback((w: number) => buildScatter(report!, suggestions, w), [report, suggestions]);
  const grid = useCallback((w: number) => buildGrid(report!, w), [report]);
  const outcomes = useCallback((w: number) => buildBars(report!.byOutcome.map((o) => ({ label: outcomeText(o.outcome), count: o.count, colour: outcomeColour(o.outcome) })), "Records per outcome", w), [report]);
  const sources = useCallback((w: number) => buildBars(report!.bySource.slice(0, 12).map((s) => ({ label: s.label.length > 44 ? `${s.label.slice(0, 43)}…` : s.label, count: s.count, colour: BAR_FILL })), "Records per source", w), [report]);
  const histograms = useMemo(() => {
    if (!report) return [];
    const h = report.histograms;
    return [
      { key: "hatch", title: "Hatch spacing", label: "Hatch spacing h (µm)", hist: h.hatchSpacingUm },
      { key: "layer", title: "Layer thickness", label: "Layer thickness t (µm)", hist: h.layerThicknessUm },
      { key: "spot", title: "Spot diameter", label: "Spot diameter d, 1/e² (µm)", hist: h.spotDiameterUm },
      { key: "energy", title: "Volumetric energy density", label: "E_v = P/(v·h·t) (J/mm³)", hist: h.volumetricEnergyJMm3 },
    ].map((x) => ({ ...x, build: x.hist ? (w: number) => buildHistogram(x.hist!, x.label, w) : null }));
  }, [report]);
  const defaults = suggestionDefaults(report);

  return (
    <div className="coverage-layout">
      <aside className="panel coverage-filters" aria-label="Coverage filters">
        <form onSubmit={submit} noValidate aria-label="Coverage filters">
          <Select label="Alloy" {...text("alloy")} options={[{ value: "", label: "All alloys" }, ...alloys.map((a) => ({ value: a, label: a }))]} />
          <fieldset className="fieldset">
            <legend className="field__label">Status</legend>
            {RECORD_STATUSES.map((s) => (
              <Checkbox key={s} name="status" value={s} label={statusLabel(s)} checked={statuses.includes(s)} onChange={(e) => toggleStatus(s, e.currentTarget.checked)} />
            ))}
          </fieldset>
          <TextField label="Hatch spacing" {...text("hatch")} placeholder="e.g. 80-120um" hint="A range or one value, any unit" optional />
          <TextField label="Layer thickness" {...text("layer")} placeholder="e.g. 30um" optional />
          <TextField label="Spot diameter" {...text("spot")} placeholder="e.g. 60-100um" optional />
          <TextField label="k (records a cell needs)" {...text("k")} placeholder="3" inputMode="numeric" optional />
          <details className="coverage-filters__more">
            <summary>Grid and window</summary>
            <TextField label="Power range of the grid" {...text("power")} placeholder="from the data" optional />
            <TextField label="Speed range of the grid" {...text("speed")} placeholder="from the data" optional />
            <TextField label="Power bins" {...text("powerBins")} placeholder="12" inputMode="numeric" optional />
            <TextField label="Speed bins" {...text("speedBins")} placeholder="12" inputMode="numeric" optional />
            <Select label="Power axis" {...text("powerScale")} options={SCALE_OPTIONS} />
            <Select label="Speed axis" {...text("speedScale")} options={SCALE_OPTIONS} />
            <TextField label="Window hatch" {...text("windowHatch")} placeholder={report?.window ? `${formatNumber(report.window.hatchSpacingUm, 1)} µm` : "from the filter"} optional />
            <TextField label="Window layer" {...text("windowLayer")} placeholder={report?.window ? `${formatNumber(report.window.layerThicknessUm, 1)} µm` : "from the filter"} optional />
            <TextField label="Window spot" {...text("windowSpot")} placeholder={report?.window ? `${formatNumber(report.window.spotDiameterUm, 1)} µm` : "from the data"} optional />
          </details>
          <div className="form-actions">
            <button type="submit" className="button button--primary" disabled={loading}>
              {loading ? "Updating…" : "Show coverage"}
            </button>
            <button type="button" className="button button--ghost" onClick={reset}>
              Clear
            </button>
          </div>
        </form>
      </aside>

      <div className="coverage-main" aria-busy={loading}>
        {error ? (
          <Alert tone="error" title="The filters need attention">
            <p>{error.message}</p>
            <ul>
              {Object.entries(fieldErrors).map(([f, m]) => (
                <li key={f}>
                  {f}: {m.join(" ")}
                </li>
              ))}
            </ul>
          </Alert>
        ) : null}
        {report ? <Summary report={report} /> : null}
        {report && report.empty ? (
          <div className="panel">
            <EmptyState title="Nothing to chart for this selection">
              <p>{report.emptyReason}</p>
            </EmptyState>
          </div>
        ) : null}
        {report && !report.empty ? (
          <>
            <div className="chart-row">
              <section className="panel" aria-labelledby="scatter-title">
                <h2 id="scatter-title" className="visually-hidden">Power–speed scatter</h2>
                <ChartFigure title="Power–speed plane by outcome" filename={`coverage-scatter-${name}`} build={scatter} summary={`${report.points.laserPowerW.length} points`} height={480} />
              </section>
              <section className="panel" aria-labelledby="grid-title">
                <h2 id="grid-title" className="visually-hidden">Count grid</h2>
                <ChartFigure title="Records per cell" filename={`coverage-grid-${name}`} build={grid} summary={`${report.counts.length} × ${report.counts[0]?.length ?? 0} cells`} height={480} />
              </section>
            </div>
            <SparseTable report={report} />
            <div className="chart-row chart-row--four">
              {histograms.map((h) => (
                <section className="panel" key={h.key} aria-label={h.title}>
                  {h.build ? <ChartFigure title={h.title} filename={`coverage-${h.key}-${name}`} build={h.build} summary={h.label} height={260} /> : <p className="muted">{h.title}: no record gives a value.</p>}
                </section>
              ))}
            </div>
            <div className="chart-row">
              <section className="panel" aria-label="Records per outcome">
                <ChartFigure title="Records per outcome" filename={`coverage-outcomes-${name}`} build={outcomes} summary="Counts per outcome" height={200} />
              </section>
              <section className="panel" aria-label="Records per source">
                <ChartFigure title="Records per source" filename={`coverage-sources-${name}`} build={sources} summary="Counts per source" height={200} />
              </section>
            </div>
          </>
        ) : null}
        <SuggestionsPanel key={`${defaults?.alloy ?? ""}|${defaults?.hatch ?? ""}|${defaults?.layer ?? ""}`} defaults={defaults} onSet={setSet} />
      </div>
    </div>
  );
}

function Summary({ report: r }: { report: CoverageReport }) {
  const w = r.window;
  if (r.empty) {
    return (
      <section className="panel coverage-summary" aria-label="Coverage summary">
        <div className="stat">
          <span className="stat__value">{formatNumber(r.nRecords, 0)}</span>
          <span className="stat__label">records in the selection</span>
        </div>
      </section>
    );
  }
  return (
    <section className="panel coverage-summary" aria-label="Coverage summary">
      <div className="stat">
        <span className="stat__value">{formatNumber(r.nRecords, 0)}</span>
        <span className="stat__label">records in the selection</span>
      </div>
      <div className="stat">
        <span className="stat__value">{formatNumber(r.nOnGrid, 0)}</span>
        <span className="stat__label">
          on the grid{r.nOutsideGrid ? `; ${formatNumber(r.nOutsideGrid, 0)} outside its range` : ""}
          {r.nWithoutPowerOrSpeed ? `; ${formatNumber(r.nWithoutPowerOrSpeed, 0)} without power or speed` : ""}
        </span>
      </div>
      <div className="stat">
        <span className="stat__value" data-testid="coverage-score">{pct(r.score.share)}</span>
        <span className="stat__label">
          coverage score: {formatNumber(r.score.covered, 0)} of {formatNumber(r.score.windowCells, 0)} {w ? "window cells" : "grid cells"} hold ≥ {r.score.k} records{w ? "" : " (no window: choose one alloy)"}
        </span>
      </div>
      <div className="coverage-summary__window">
        {w ? (
          <p>
            <strong>Window</strong> for {w.alloyName} at h {formatNumber(w.hatchSpacingUm, 1)} µm ({BASIS_WORDS[w.basis.hatch]}), t {formatNumber(w.layerThicknessUm, 1)} µm ({BASIS_WORDS[w.basis.layer]}), d{" "}
            {formatNumber(w.spotDiameterUm, 1)} µm ({BASIS_WORDS[w.basis.spot]}): no defect strongly predicted by the Eagar–Tsai criteria (margins {formatNumber(w.margins.lack_of_fusion)} lack of fusion,{" "}
            {formatNumber(w.margins.keyhole)} keyhole, {formatNumber(w.margins.balling)} balling; check settings version {w.settingsVersion}). An indicator, not a guarantee.
            {w.notes.length ? ` ${w.notes.join("; ")}.` : ""}
          </p>
        ) : (
          <p className="muted">{r.windowUnavailable}</p>
        )}
        {Object.keys(r.score.byOutcome).length ? (
          <table className="table table--compact" aria-label="Coverage score per outcome">
            <thead>
              <tr>
                <th>Outcome</th>
                <th className="num">Cells with ≥ {r.score.k}</th>
                <th className="num">Share</th>
              </tr>
            </thead>
            <tbody>
              {Object.entries(r.score.byOutcome).map(([o, s]) => (
                <tr key={o}>
                  <td>{outcomeText(o)}</td>
                  <td className="num">{s.covered}</td>
                  <td className="num">{pct(s.share)}</td>
                </tr>
              ))}
            </tbody>
          </table>
        ) : null}
      </div>
    </section>
  );
}

function SparseTable({ report: r }: { report: CoverageReport }) {
  const inWindow = r.sparseCells.filter((c) => c.inWindow !== false);
  const shown = inWindow.slice(0, 12);
  const edge = (x: number | undefined) => formatNumber(x, x !== undefined && x < 10 ? 2 : 0);
  return (
    <section className="panel" aria-labelledby="sparse-title">
      <div className="panel__title">
        <h2 id="sparse-title">Thinnest cells{r.window ? " inside the window" : ""}</h2>
        <span className="muted">
          {inWindow.length} cell(s) with fewer than {r.score.k} records{r.window ? " inside the window" : ""}; {r.sparseCells.filter((c) => c.count === 0).length} empty cell(s) on the whole grid
        </span>
      </div>
      {shown.length ? (
        <div className="table-wrap">
          <table className="table table--compact" aria-label="Thinnest cells">
            <thead>
              <tr>
                <th>Power (W)</th>
                <th>Speed (mm/s)</th>
                <th className="num">Records</th>
              </tr>
            </thead>
            <tbody>
              {shown.map((c) => (
                <tr key={`${c.powerIndex}-${c.speedIndex}`}>
                  <td>
                    {edge(r.powerEdgesW[c.powerIndex])}–{edge(r.powerEdgesW[c.powerIndex + 1])}
                  </td>
                  <td>
                    {edge(r.speedEdgesMmPerS[c.speedIndex])}–{edge(r.speedEdgesMmPerS[c.speedIndex + 1])}
                  </td>
                  <td className="num">{c.count}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      ) : (
        <p className="muted">Every {r.window ? "window " : ""}cell holds at least {r.score.k} records.</p>
      )}
    </section>
  );
}
