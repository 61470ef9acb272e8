import { createReadStream } from "node:fs";
import { Readable } from "node:stream";
import { openExportFile } from "@/lib/server/exports";
import { requestActor } from "../../../../_lib/actor";
import { errorResponse } from "../../../_lib/json";

export const dynamic = "force-dynamic";

/**
 * GET /api/exports/:name/:file — one file of a saved export (train.csv, test.parquet, manifest.json,
 * DATASHEET.md, …) for ML pipelines. Names are checked against fixed patterns by the server layer.
 * In team mode the request needs a signed-in session (its cookie); in local mode, loopback only.
 */
export async function GET(request: Request, { params }: { params: Promise<{ name: string; file: string }> }) {
  const actor = await requestActor(request);
  if (!actor.ok) return errorResponse(actor.error);
  const { name, file } = await params;
  const result = await openExportFile(name, file);
  if (!result.ok) return errorResponse(result.error);
  const { path, sizeBytes, contentType, sha256 } = result.data;
  return new Response(Readable.toWeb(createReadStream(path)) as ReadableStream, {
    headers: {
      "Content-Type": contentType,
      "Content-Length": String(sizeBytes),
      "Content-Disposition": `attachment; filename="${name}-${file}"`,
      "X-Content-Type-Options": "nosniff",
      ETag: `"${sha256}"`,
      "Cache-Control": "private, max-age=0, must-revalidate",
    },
  });
}
