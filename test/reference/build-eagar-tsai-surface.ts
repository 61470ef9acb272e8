/**
 * Regenerates lib/domain/data/eagar-tsai-surface.json, the precomputed Eagar–Tsai solution surface,
 * by direct integration at every node and at test points in every cell (a few minutes on one core).
 *
 *   npx tsx test/reference/build-eagar-tsai-surface.ts
 *
 * lib/domain/eagar-tsai-surface.test.ts re-solves sample nodes and checks the file is current.
 */
import { writeFileSync } from "node:fs";
import path from "node:path";
import { buildSurfaceTable, DEFAULT_SURFACE_SPECS, type SurfaceFile, type SurfaceTable } from "../../lib/domain/eagar-tsai-surface";

const started = Date.now();
const round = (v: number): number => Number(v.toPrecision(12));
const tables: SurfaceTable[] = DEFAULT_SURFACE_SPECS.map((spec, k) => {
  const table = buildSurfaceTable(spec, (done, total) => {
    process.stdout.write(`\rtable ${k + 1}/${DEFAULT_SURFACE_SPECS.length}: row ${done}/${total} (${((Date.now() - started) / 1000).toFixed(0)} s)`);
  });
  return {
    ...table,
    lnPeakG: table.lnPeakG.map(round),
    lnHalfWidthHead: table.lnHalfWidthHead.map(round),
    lnHalfWidthTail: table.lnHalfWidthTail.map(round),
    lnDepth: table.lnDepth.map(round),
    lnLength: table.lnLength.map(round),
  };
});
const file: SurfaceFile = {
  description: "Eagar–Tsai melt-pool solution surface (finest table first); see lib/domain/eagar-tsai-surface.ts",
  tables,
};
const target = path.join(import.meta.dirname, "../../lib/domain/data/eagar-tsai-surface.json");
writeFileSync(target, `${JSON.stringify(file)}\n`);
process.stdout.write(`\nwrote ${target} in ${((Date.now() - started) / 1000).toFixed(0)} s\n`);
