import { NextResponse } from "next/server";
import { previewImportRequest } from "@/lib/server/import-jobs";
import { requestActor } from "../../../_lib/actor";
import { errorResponse, readJson } from "../../_lib/json";

export const dynamic = "force-dynamic";

/** POST /api/imports/preview: the mapping as resolved and every row's problems; writes nothing. */
export async function POST(request: Request) {
  const actor = await requestActor(request);
  if (!actor.ok) return errorResponse(actor.error);
  const body = await readJson(request);
  if (!body.ok) return errorResponse(body.error);
  const result = await previewImportRequest(body.body);
  if (!result.ok) return errorResponse(result.error);
  const a = result.data;
  // the page shows the first problems; the counts say how many there are in all
  return NextResponse.json({ ...a, problems: a.problems.slice(0, 2000), problemCount: a.problems.length });
}
