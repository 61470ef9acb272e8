import { NextResponse, type NextRequest } from "next/server";
import { createSuggestionSet } from "@/lib/server/suggestions";
import { requestActor } from "../../../_lib/actor";
import { errorResponse, readJson } from "../../_lib/json";

export const dynamic = "force-dynamic";

/** POST /api/coverage/suggestions with the request as JSON -> 201 the stored suggestion set. */
export async function POST(request: NextRequest) {
  const actor = await requestActor(request);
  if (!actor.ok) return errorResponse(actor.error);
  const body = await readJson(request);
  if (!body.ok) return errorResponse(body.error);
  const result = await createSuggestionSet(body.body, actor.data);
  if (!result.ok) return errorResponse(result.error);
  return NextResponse.json(result.data, { status: 201, headers: { Location: `/api/coverage/suggestions/${result.data.id}` } });
}
