/**
 * Regenerates lib/domain/data/eagar-tsai-surface.json, the precomputed Eagar–Tsai solution surface,
 * by direct integration at every node (about half a minute on one core).
 *
 *   npx tsx test/reference/build-eagar-tsai-surface.ts
 *
 * lib/domain/eagar-tsai-surface.test.ts re-solves sample nodes and checks the file is current.
 */
import { writeFileSync } from "node:fs";
import path from "node:path";
import { buildSurfaceTable, DEFAULT_SURFACE_SPEC } from "../../lib/domain/eagar-tsai-surface";

const started = Date.now();
const table = buildSurfaceTable(DEFAULT_SURFACE_SPEC, (done, total) => {
  process.stdout.write(`\rrow ${done}/${total} (${((Date.now() - started) / 1000).toFixed(0)} s)`);
});
const round = (v: number | null): number | null => (v === null ? null : Number(v.toPrecision(12)));
const rounded = {
  ...table,
  lnPeakG: table.lnPeakG.map((v) => round(v) as number),
  lnHalfWidthHead: table.lnHalfWidthHead.map((v) => round(v) as number),
  lnHalfWidthTail: table.lnHalfWidthTail.map(round),
  lnDepth: table.lnDepth.map((v) => round(v) as number),
  lnLength: table.lnLength.map((v) => round(v) as number),
};
const target = path.join(import.meta.dirname, "../../lib/domain/data/eagar-tsai-surface.json");
writeFileSync(target, `${JSON.stringify(rounded)}\n`);
process.stdout.write(`\nwrote ${target}\n`);
