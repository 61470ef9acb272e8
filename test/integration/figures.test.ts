// Records from a figure: a PDF with a power–speed plot (linear power axis, log speed axis, red
// squares for keyhole and blue circles for dense builds) is rendered by pdf.js in Node, the markers
// are found from one clicked marker per colour, the axes are calibrated from their end ticks, and
// the points are committed through the bulk insert; bad readings write nothing. On SQLite and on
// PostgreSQL.
import { beforeAll, describe, expect, test } from "vitest";
import { sql } from "@/lib/db/sql";
import { detectMarkers, type RgbaImage } from "@/lib/domain/marker-detection";
import { localActor, type Actor } from "@/lib/server/actor";
import { commitFigureReading } from "@/lib/server/figures";
import type { FigureReadingInput } from "@/lib/schemas/figure";
import { newSourceId } from "../support/sources";
import { describeEachEngine } from "../support/engines";
import { inventedFigurePdf } from "../support/pdf";
import { renderPdfPage } from "../support/pdf-render";
const figure = inventedFigurePdf();
const SCALE = 2;
let image: RgbaImage;
let toPixel: (xPt: number, yPt: number) => { x: number; y: number };

const count = async (text: string) => (await sql().get<{ n: number }>(text))!.n;
const RECORDS = `SELECT COUNT(*) AS n FROM "BuildRecord"`;

beforeAll(async () => {
  const rendered = await renderPdfPage(figure.pdf, figure.page, SCALE);
  image = { data: rendered.data, width: rendered.width, height: rendered.height };
  toPixel = rendered.toPixel;
});

function reading(sourceId: number, points: FigureReadingInput["points"], overrides: Partial<FigureReadingInput> = {}): FigureReadingInput {
  const [x0, x1] = figure.ticks.x;
  const [y0, y1] = figure.ticks.y;
  return {
    sourceId,
    page: figure.page,
    figureLabel: "Fig. 3",
    alloy: "316L",
    axes: {
      x: { field: "laserPower", unit: "W", scale: "linear", ticks: [{ pixel: toPixel(x0!.xPt, 0).x, value: x0!.value }, { pixel: toPixel(x1!.xPt, 0).x, value: x1!.value }] },
      y: { field: "scanSpeed", unit: "mm/s", scale: "log", ticks: [{ pixel: toPixel(0, y0!.yPt).y, value: y0!.value }, { pixel: toPixel(0, y1!.yPt).y, value: y1!.value }] },
    },
    fixed: { hatchSpacing: { value: "100", unit: "µm" }, layerThickness: { value: "30", unit: "µm" } },
    kinds: [
      { id: "red", outcome: "keyhole", legend: "red squares" },
      { id: "blue", outcome: "dense", legend: "blue circles" },
    ],
    points,
    ...overrides,
  };
}

function detectedPoints(): FigureReadingInput["points"] {
  const out: FigureReadingInput["points"] = [];
  for (const [kind, outcome] of [["red", "keyhole"], ["blue", "dense"]] as const) {
    const seed = figure.points.find((p) => p.outcome === outcome)!;
    const x = figure.frame.left + ((seed.laserPowerW - 100) / 300) * (figure.frame.right - figure.frame.left);
    const y = figure.frame.bottom + ((Math.log10(seed.scanSpeedMmPerS) - 2) / 2) * (figure.frame.top - figure.frame.bottom);
    const found = detectMarkers(image, toPixel(x, y));
    if (!found.ok) throw new Error(found.message);
    for (const m of found.markers) out.push({ pixel: { x: m.x, y: m.y }, kind, pixelUncertaintyPx: 1 });
  }
  return out;
}

describeEachEngine("records from figures", () => {
  let actor: Actor;
  let sourceId: number;
  beforeAll(async () => {
    actor = await localActor();
    sourceId = await newSourceId(actor, { doi: "10.5555/figure.pdf.0001", title: "Process map of 316L in an invented study" });
  });

  describe("reading a rendered figure", () => {
    test("every plotted point is found from one clicked marker per colour, within 1 % of each axis range, with its outcome", async () => {
      const points = detectedPoints();
      expect(points).toHaveLength(figure.points.length);
      const before = await count(RECORDS);
      const r = await commitFigureReading(reading(sourceId, points), actor);
      expect(r.ok).toBe(true);
      if (!r.ok) return;
      expect(r.data.ids).toHaveLength(points.length);
      expect(await count(RECORDS) - before).toBe(points.length);
      const rows = await sql().all<{ laserPowerW: number; scanSpeedMmPerS: number; hatchSpacingUm: number; layerThicknessUm: number; outcome: string; locationPage: number; locationLabel: string }>(
        `SELECT "laserPowerW", "scanSpeedMmPerS", "hatchSpacingUm", "layerThicknessUm", "outcome", "locationPage", "locationLabel" FROM "BuildRecord" WHERE "id" IN (${r.data.ids.map(() => "?").join(", ")})`,
        r.data.ids,
      );
      const matched = new Set<number>();
      for (const truth of figure.points) {
        // nearest record in axis-range units: linear power over 300 W, log speed over 2 decades
        const errors = rows.map((row) => ({ row, dp: Math.abs(row.laserPowerW - truth.laserPowerW) / 300, dv: Math.abs(Math.log10(row.scanSpeedMmPerS) - Math.log10(truth.scanSpeedMmPerS)) / 2 }));
        errors.sort((a, b) => Math.max(a.dp, a.dv) - Math.max(b.dp, b.dv));
        const best = errors[0]!;
        expect(best.dp).toBeLessThanOrEqual(0.01);
        expect(best.dv).toBeLessThanOrEqual(0.01);
        expect(best.row.outcome).toBe(truth.outcome);
        matched.add(rows.indexOf(best.row));
      }
      expect(matched.size).toBe(figure.points.length);
      for (const row of rows) {
        expect(row.locationPage).toBe(2);
        expect(row.locationLabel).toMatch(/^Fig\. 3 · px \(\d+, \d+\) · ±[\d.]+ W, ±[\d.]+ mm\/s$/);
        expect(row.hatchSpacingUm).toBe(100);
        expect(row.layerThicknessUm).toBe(30);
      }
    });

    test("the committed records ran through the checks like any record", async () => {
      // every record gets a quality score from the checks after the bulk write
      expect(await count(`SELECT COUNT(*) AS n FROM "BuildRecord" WHERE "locationLabel" LIKE 'Fig. 3 ·%' AND "qualityScore" IS NULL`)).toBe(0);
    });

    test("a dry run shows the records and writes nothing", async () => {
      const before = await count(RECORDS);
      const r = await commitFigureReading({ ...reading(sourceId, detectedPoints().slice(0, 3)), dryRun: true }, actor);
      expect(r.ok && r.data.records.length).toBe(3);
      expect(r.ok && r.data.ids).toEqual([]);
      expect(await count(RECORDS)).toBe(before);
    });
  });

  describe("bad readings write nothing and say why", () => {
    const one = () => detectedPoints().slice(0, 2);
    test.each([
      ["axes marked with equal values", (r: FigureReadingInput) => ({ ...r, axes: { ...r.axes, x: { ...r.axes.x, ticks: [r.axes.x.ticks[0], { ...r.axes.x.ticks[1], value: r.axes.x.ticks[0].value }] as const } } }), /same value/],
      ["a log axis with a non-positive value", (r: FigureReadingInput) => ({ ...r, axes: { ...r.axes, y: { ...r.axes.y, ticks: [{ ...r.axes.y.ticks[0], value: 0 }, r.axes.y.ticks[1]] as const } } }), /logarithmic, so both marked values must be greater than 0/],
      ["a point outside the marked axes", (r: FigureReadingInput) => ({ ...r, points: [...r.points, { pixel: { x: 5, y: 5 }, kind: "red" }] }), /outside the marked/],
      ["a unit that is not the axis quantity's", (r: FigureReadingInput) => ({ ...r, axes: { ...r.axes, x: { ...r.axes.x, unit: "mm/s" } } }), /rows? have problems|would not make valid records|points would not/],
      ["an unknown source", (r: FigureReadingInput) => ({ ...r, sourceId: 99_999 }), /Source 99999 does not exist/],
    ])("%s", async (_name, change, message) => {
      const before = await count(RECORDS);
      const r = await commitFigureReading(change(reading(sourceId, one())), actor);
      expect(r.ok).toBe(false);
      if (!r.ok) {
        expect(r.error.code).toBe("invalid_input");
        expect(r.error.message).toMatch(message);
      }
      expect(await count(RECORDS)).toBe(before);
    });
  });
});
