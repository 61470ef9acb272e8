import { NextResponse, type NextRequest } from "next/server";
import { commitFigureReading } from "@/lib/server/figures";
import { requestActor } from "../../_lib/actor";
import { errorResponse, readJson } from "../_lib/json";

export const dynamic = "force-dynamic";

/**
 * POST /api/figures with a figure reading (axes with two ticks each, fixed parameters, marker kinds
 * and points) -> 201 { ids, records } when written, 200 { records } with "dryRun": true.
 */
export async function POST(request: NextRequest) {
  const actor = await requestActor(request);
  if (!actor.ok) return errorResponse(actor.error);
  const body = await readJson(request);
  if (!body.ok) return errorResponse(body.error);
  const result = await commitFigureReading(body.body, actor.data);
  if (!result.ok) return errorResponse(result.error);
  return NextResponse.json(result.data, { status: result.data.dryRun ? 200 : 201 });
}
