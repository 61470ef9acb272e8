"use client";

import * as Plot from "@observablehq/plot";
import { useEffect, useRef, useState } from "react";
import type { Histogram } from "@/lib/domain/histogram";
import type { CoverageReport } from "@/lib/server/coverage";
import type { Suggestion } from "@/lib/domain/suggestions";
import { formatNumber } from "../../_components/format";
import { outcomeText } from "../../_components/labels";
import { outcomeColour } from "../../_components/palette";
import { BAR_FILL, COUNT_RAMP, COUNT_TEXT, MECHANISM_LINES, OUTCOME_SYMBOLS, OUTSIDE_HATCH, SUGGESTION_MARK, WINDOW_FILL } from "./chart-palette";
import { composeChart, downloadPng, downloadSvg, hatchPattern, type LegendItem } from "./chart-svg";

const STYLE = { fontFamily: 'system-ui, -apple-system, "Segoe UI", Roboto, "Noto Sans", "Liberation Sans", Arial, sans-serif', fontSize: "12px", background: "#ffffff", color: "#1b2128" };
const POWER_LABEL = "Laser power P (W)";
const SPEED_LABEL = "Scan speed v (mm/s)";
/** Plain numbers with thousands separators (no SI prefixes: "100m" would read as 100 metres). */
const TICKS = (d: number) => d.toLocaleString("en-US", { maximumFractionDigits: 3 });

interface Built {
  plot: SVGSVGElement;
  legend: LegendItem[];
  description: string;
  defs?: SVGElement[];
  footnote?: string;
}

/**
 * One chart: built by the plotting library in the browser, wrapped with its title and legend, with
 * buttons that download exactly what is shown as SVG or PNG.
 */
export function ChartFigure({ title, filename, build, summary, height = 360 }: { title: string; filename: string; build: (width: number) => Built; summary: string; height?: number }) {
  const holder = useRef<HTMLDivElement>(null);
  const current = useRef<SVGSVGElement | null>(null);
  const [problem, setProblem] = useState<string | null>(null);
  useEffect(() => {
    try {
      // Drawn at the width of its column, so text keeps its size instead of being scaled.
      const width = Math.max(320, Math.min(900, Math.floor(holder.current?.clientWidth ?? 560)));
      const b = build(width);
      const svg = composeChart(b.plot, { title, description: b.description, legend: b.legend, defs: b.defs, footnote: b.footnote });
      svg.setAttribute("class", "chart-svg");
      current.current = svg;
      holder.current?.replaceChildren(svg);
      if (holder.current) holder.current.style.minHeight = "0";
      setProblem(null);
    } catch (error) {
      setProblem((error as Error).message);
    }
  }, [build, title]);
  return (
    <figure className="chart">
      <div className="chart__tools">
        <button type="button" className="button button--small" aria-label={`Download “${title}” as SVG`} onClick={() => current.current && downloadSvg(current.current, `${filename}.svg`)}>
          SVG
        </button>
        <button
          type="button"
          className="button button--small"
          aria-label={`Download “${title}” as PNG`}
          onClick={() => current.current && downloadPng(current.current, `${filename}.png`).catch((e: Error) => setProblem(e.message))}
        >
          PNG
        </button>
      </div>
      <div className="chart__canvas" ref={holder} style={{ minHeight: height }} data-chart={filename}>
        <p className="muted chart__placeholder">{summary}</p>
      </div>
      {problem ? <p className="field__error">{problem}</p> : null}
    </figure>
  );
}

function cellRects(r: CoverageReport) {
  const cells: { i: number; j: number; x1: number; x2: number; y1: number; y2: number; count: number; inWindow: boolean | null }[] = [];
  r.counts.forEach((row, i) =>
    row.forEach((count, j) =>
      cells.push({
        i, j, count,
        x1: r.speedEdgesMmPerS[j]!, x2: r.speedEdgesMmPerS[j + 1]!, y1: r.powerEdgesW[i]!, y2: r.powerEdgesW[i + 1]!,
        inWindow: r.window ? (r.window.mask[i]?.[j] ?? false) : null,
      }),
    ),
  );
  return cells;
}

function axes(r: CoverageReport) {
  return {
    x: { type: r.speedAxis?.scale === "log" ? ("log" as const) : ("linear" as const), domain: [r.speedEdgesMmPerS[0]!, r.speedEdgesMmPerS.at(-1)!], label: SPEED_LABEL, labelAnchor: "center" as const, grid: true, nice: false, tickFormat: TICKS },
    y: { type: r.powerAxis?.scale === "log" ? ("log" as const) : ("linear" as const), domain: [r.powerEdgesW[0]!, r.powerEdgesW.at(-1)!], label: POWER_LABEL, labelAnchor: "center" as const, grid: true, nice: false, tickFormat: TICKS },
  };
}

function boundaryMarks(r: CoverageReport) {
  if (!r.window) return { marks: [], legend: [] as LegendItem[] };
  const marks: Plot.Markish[] = [];
  const legend: LegendItem[] = [];
  for (const b of r.window.boundaries) {
    if (!b.lines.length) continue;
    const style = MECHANISM_LINES[b.mechanism];
    const rows = b.lines.flatMap((line, li) => line.map((p) => ({ x: p.scanSpeedMmPerS, y: p.laserPowerW, line: li })));
    marks.push(Plot.line(rows, { x: "x", y: "y", z: "line", stroke: "#ffffff", strokeWidth: 4.5, strokeOpacity: 0.85 }));
    marks.push(Plot.line(rows, { x: "x", y: "y", z: "line", stroke: style.colour, strokeWidth: 2.2, strokeDasharray: style.dash || undefined }));
    legend.push({ kind: "line", label: style.label, colour: style.colour, dash: style.dash });
  }
  return { marks, legend };
}

function windowFootnote(r: CoverageReport): string {
  if (!r.window) return r.windowUnavailable ?? "";
  const w = r.window;
  return `Window for ${w.alloyName}: h ${formatNumber(w.hatchSpacingUm, 1)} µm, t ${formatNumber(w.layerThicknessUm, 1)} µm, d ${formatNumber(w.spotDiameterUm, 1)} µm (Eagar–Tsai criteria beyond the check margins).`;
}

/** Power–speed scatter coloured (and shaped) by outcome, with the window, its boundaries and any suggestions. */
export function buildScatter(r: CoverageReport, suggestions: readonly Suggestion[], width = 560): Built {
  const points = r.points.laserPowerW.map((p, i) => ({ p, v: r.points.scanSpeedMmPerS[i]!, o: r.points.outcome[i]! }));
  const present = [...new Set(r.points.outcome)];
  const windowCells = cellRects(r).filter((c) => c.inWindow);
  const bounds = boundaryMarks(r);
  // Suggestions for another hatch or layer than the plane drawn are hollow: the window shown is not theirs.
  const near = (a: number, b: number) => Math.abs(a - b) <= 0.1 * b;
  const w = r.window;
  const onPlane = suggestions.filter((x) => !w || (near(x.hatchSpacingUm, w.hatchSpacingUm) && near(x.layerThicknessUm, w.layerThicknessUm)));
  const offPlane = suggestions.filter((x) => !onPlane.includes(x));
  const plot = Plot.plot({
    width,
    height: Math.round(Math.min(500, width * 0.78)),
    marginLeft: 58,
    marginBottom: 44,
    style: STYLE,
    ...axes(r),
    symbol: { domain: Object.keys(OUTCOME_SYMBOLS), range: Object.values(OUTCOME_SYMBOLS) },
    marks: [
      Plot.rect(windowCells, { x1: "x1", x2: "x2", y1: "y1", y2: "y2", fill: WINDOW_FILL }),
      Plot.frame({ stroke: "#7c8692" }),
      Plot.dot(points, { x: "v", y: "p", symbol: "o", fill: (d: { o: string }) => outcomeColour(d.o), stroke: "#1b2128", strokeOpacity: 0.55, strokeWidth: 0.6, r: 3.2 }),
      ...bounds.marks,
      Plot.dot(onPlane, { x: "scanSpeedMmPerS", y: "laserPowerW", symbol: "star", fill: SUGGESTION_MARK, stroke: "#ffffff", strokeWidth: 0.8, r: 6 }),
      Plot.dot(offPlane, { x: "scanSpeedMmPerS", y: "laserPowerW", symbol: "star", fill: "#ffffff", stroke: SUGGESTION_MARK, strokeWidth: 1.2, r: 6 }),
    ],
  }) as unknown as SVGSVGElement;
  const legend: LegendItem[] = [
    ...present.map((o) => ({ kind: "symbol" as const, label: outcomeText(o), colour: outcomeColour(o), symbol: OUTCOME_SYMBOLS[o as keyof typeof OUTCOME_SYMBOLS] ?? "circle" })),
    ...(windowCells.length ? [{ kind: "swatch" as const, label: "inside the predicted window", colour: WINDOW_FILL }] : []),
    ...bounds.legend,
    ...(onPlane.length ? [{ kind: "symbol" as const, label: "suggested experiment", colour: SUGGESTION_MARK, symbol: "star" }] : []),
    ...(offPlane.length ? [{ kind: "symbol" as const, label: "suggested, for another hatch or layer", colour: "#ffffff", symbol: "star" }] : []),
  ];
  const counts = r.byOutcome.map((o) => `${outcomeText(o.outcome)} ${o.count}`).join(", ");
  return {
    plot,
    legend,
    description: `Scatter of ${points.length} records, scan speed ${formatNumber(r.speedEdgesMmPerS[0])}–${formatNumber(r.speedEdgesMmPerS.at(-1))} mm/s against laser power ${formatNumber(r.powerEdgesW[0])}–${formatNumber(r.powerEdgesW.at(-1))} W; outcomes: ${counts}.`,
    footnote: [r.pointsNote, r.nOutsideGrid ? `${r.nOutsideGrid} record(s) outside the grid's range are not shown.` : "", windowFootnote(r)].filter(Boolean).join(" "),
  };
}

function rampIndex(count: number, max: number): number {
  if (count <= 0) return 0;
  return Math.min(5, Math.max(1, Math.ceil((count / Math.max(1, max)) * 5)));
}

/** The count grid with empty and sparse cells marked, the window, and its boundaries. */
export function buildGrid(r: CoverageReport, width = 560): Built {
  const k = r.score.k;
  const cells = cellRects(r);
  const max = Math.max(1, ...cells.map((c) => c.count));
  const hatchId = `outside-${Math.random().toString(36).slice(2, 8)}`;
  const bounds = boundaryMarks(r);
  const centre = (a: number, b: number, log: boolean) => (log ? Math.sqrt(a * b) : (a + b) / 2);
  const xLog = r.speedAxis?.scale === "log";
  const yLog = r.powerAxis?.scale === "log";
  const labelled = cells.map((c) => ({ ...c, cx: centre(c.x1, c.x2, xLog), cy: centre(c.y1, c.y2, yLog), step: rampIndex(c.count, max) }));
  const plot = Plot.plot({
    width,
    height: Math.round(Math.min(500, width * 0.78)),
    marginLeft: 58,
    marginBottom: 44,
    style: STYLE,
    ...axes(r),
    marks: [
      Plot.rect(labelled, { x1: "x1", x2: "x2", y1: "y1", y2: "y2", fill: (d: { step: number }) => COUNT_RAMP[d.step], stroke: "#d3d8de", strokeWidth: 0.5 }),
      Plot.rect(labelled.filter((c) => c.inWindow === false), { x1: "x1", x2: "x2", y1: "y1", y2: "y2", fill: `url(#${hatchId})`, fillOpacity: 0.55 }),
      Plot.rect(labelled.filter((c) => c.count < k), { x1: "x1", x2: "x2", y1: "y1", y2: "y2", fill: "none", stroke: "#1b2128", strokeWidth: 1.5, strokeDasharray: "3 2", inset: 1.5 }),
      ...[labelled.filter((c) => c.count >= k), labelled.filter((c) => c.count < k)].map((group, bold) =>
        Plot.text(group, { x: "cx", y: "cy", text: (d: { count: number }) => String(d.count), fill: (d: { step: number }) => COUNT_TEXT[d.step], fontWeight: bold ? 700 : 400, fontSize: 11 }),
      ),
      Plot.frame({ stroke: "#7c8692" }),
      ...bounds.marks,
    ],
  }) as unknown as SVGSVGElement;
  // Step s holds the counts c with (s − 1)·max/5 < c ≤ s·max/5 (rampIndex); steps without a whole count are left out.
  const classes = [1, 2, 3, 4, 5]
    .map((s) => ({ s, lo: Math.floor(((s - 1) * max) / 5) + 1, hi: Math.floor((s * max) / 5) }))
    .filter((c) => c.lo <= c.hi);
  const legend: LegendItem[] = [
    { kind: "swatch", label: "0 records", colour: COUNT_RAMP[0] },
    ...classes.map((c) => ({ kind: "swatch" as const, label: c.lo === c.hi ? `${c.lo}` : `${c.lo}–${c.hi}`, colour: COUNT_RAMP[c.s]! })),
    { kind: "outline", label: `fewer than k = ${k} records`, dash: "3 2" },
    ...(r.window ? [{ kind: "hatch" as const, label: "outside the predicted window" }] : []),
    ...bounds.legend,
  ];
  const sparse = r.sparseCells.length;
  const empty = r.sparseCells.filter((c) => c.count === 0).length;
  return {
    plot,
    legend,
    defs: [hatchPattern(hatchId, OUTSIDE_HATCH)],
    description: `Record counts in ${cells.length} cells (${r.powerEdgesW.length - 1} power bins by ${r.speedEdgesMmPerS.length - 1} speed bins); ${empty} empty and ${sparse} with fewer than ${k} records; most in one cell ${max}.`,
    footnote: windowFootnote(r),
  };
}

/** A histogram of one quantity. */
export function buildHistogram(h: Histogram, label: string, width = 420): Built {
  const bins = h.counts.map((count, i) => ({ x1: h.edges[i]!, x2: h.edges[i + 1]!, count }));
  const plot = Plot.plot({
    width,
    height: Math.round(Math.min(260, width * 0.52)),
    marginLeft: 52,
    marginBottom: 42,
    style: STYLE,
    x: { type: h.scale === "log" ? "log" : "linear", label, labelAnchor: "center", domain: [h.edges[0]!, h.edges.at(-1)!], tickFormat: TICKS },
    y: { label: "Records", labelAnchor: "center", grid: true },
    marks: [Plot.rectY(bins, { x1: "x1", x2: "x2", y: "count", fill: BAR_FILL, inset: 0.5 }), Plot.ruleY([0], { stroke: "#1b2128" })],
  }) as unknown as SVGSVGElement;
  const total = h.counts.reduce((a, b) => a + b, 0);
  return {
    plot,
    legend: [],
    description: `${label}: ${total} records in ${bins.length} bins from ${formatNumber(h.edges[0])} to ${formatNumber(h.edges.at(-1))}${h.missing ? `; ${h.missing} without a value` : ""}${h.outside ? `; ${h.outside} outside the plausible range` : ""}.`,
    footnote:
      [h.missing ? `${h.missing} without a value` : "", h.outside ? `${h.outside} outside the plausible range (see Rules; likely unit slips)` : ""].filter(Boolean).join("; ").replace(/^./, (c) => c.toUpperCase()) + (h.missing || h.outside ? " — not shown." : "") || undefined,
  };
}

/** Horizontal bars of counts, each labelled with its value. */
export function buildBars(items: readonly { label: string; count: number; colour: string }[], what: string, width = 560): Built {
  const marginLeft = Math.min(300, 12 + Math.max(...items.map((i) => i.label.length)) * 6.4);
  const plot = Plot.plot({
    width,
    height: Math.max(110, items.length * 26 + 50),
    marginLeft,
    marginRight: 48,
    marginBottom: 36,
    style: STYLE,
    x: { label: "Records", labelAnchor: "center", grid: true },
    y: { label: null, domain: items.map((i) => i.label) },
    marks: [
      Plot.barX(items, { x: "count", y: "label", fill: (d: { colour: string }) => d.colour, stroke: "#1b2128", strokeOpacity: 0.45, strokeWidth: 0.75 }),
      Plot.text(items, { x: "count", y: "label", text: (d: { count: number }) => formatNumber(d.count, 0), dx: 6, textAnchor: "start" }),
      Plot.ruleX([0], { stroke: "#1b2128" }),
    ],
  }) as unknown as SVGSVGElement;
  return { plot, legend: [], description: `${what}: ${items.map((i) => `${i.label} ${i.count}`).join(", ")}.` };
}
