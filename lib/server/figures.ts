import { calibrateFigure } from "../domain/figure-calibration";
import { figureRecordInputs, type FigureRecordInput } from "../domain/figure-records";
import { figureReadingSchema } from "../schemas/figure";
import { requireRole, type Actor } from "./actor";
import { insertRecordsBulk, prepareBulkRow, type RowError } from "./records-bulk";
import { fail, guard, invalid, nulRefusal, ok, type Result } from "./result";

export interface FigureCommitResult {
  /** Record ids in point order; empty on a dry run. */
  ids: number[];
  /** What each point becomes (also on a dry run), in point order. */
  records: FigureRecordInput[];
  dryRun: boolean;
}

/**
 * Reads a figure's points into records: calibrates the axes, turns each point into a record input
 * (value, fixed parameters, outcome, provenance in the location) and writes them all in one
 * transaction through the bulk insert, so the usual checks run on them afterwards. Any problem
 * (a bad calibration, a point outside the axes, a row the record schema refuses) writes nothing.
 * With `dryRun`, everything is checked and nothing is written.
 */
export async function commitFigureReading(input: unknown, actor: Actor): Promise<Result<FigureCommitResult>> {
  return guard(async (): Promise<Result<FigureCommitResult>> => {
    requireRole(actor, "contributor");
    const nul = nulRefusal(input);
    if (nul) return nul;
    const parsed = figureReadingSchema.safeParse(input);
    if (!parsed.success) return invalid(parsed.error, "The figure reading needs attention; nothing was written.");
    const r = parsed.data;
    const calibration = calibrateFigure({ x: r.axes.x, y: r.axes.y });
    if (!calibration.ok) {
      return fail("invalid_input", calibration.problems.map((p) => p.message).join(" "), {
        fieldErrors: Object.fromEntries(calibration.problems.map((p) => [`axes.${p.axis}.ticks`, [p.message]])),
      });
    }
    const built = figureRecordInputs(calibration.calibration, {
      sourceId: r.sourceId,
      page: r.page,
      figureLabel: r.figureLabel,
      alloy: r.alloy,
      x: { field: r.axes.x.field, unit: r.axes.x.unit },
      y: { field: r.axes.y.field, unit: r.axes.y.unit },
      fixed: r.fixed,
      kinds: r.kinds,
    }, r.points);
    if (!built.ok) {
      const pointErrors = built.problems.map((p) => ({ point: p.point, message: p.message }));
      return fail("invalid_input", `${built.problems.length === 1 ? built.problems[0]!.message : `${built.problems.length} problems`}; nothing was written.`, { pointErrors });
    }
    if (r.dryRun) {
      const rowErrors: RowError[] = [];
      built.records.forEach((rec, i) => {
        const p = prepareBulkRow(rec, i + 1);
        if (!p.ok) rowErrors.push(...p.errors);
      });
      if (rowErrors.length) return fail("invalid_input", `${new Set(rowErrors.map((e) => e.row)).size} of ${built.records.length} points would not make valid records.`, { rowErrors });
      return ok({ ids: [], records: built.records, dryRun: true });
    }
    const written = await insertRecordsBulk(built.records, actor, { auditAction: "figure_create" });
    if (!written.ok) return written;
    return ok({ ids: written.data.ids, records: built.records, dryRun: false });
  });
}
