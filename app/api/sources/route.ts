import { NextResponse, type NextRequest } from "next/server";
import { createSource, listSources } from "@/lib/server/sources";
import { requestActor } from "../../_lib/actor";
import { errorResponse, readJson } from "../_lib/json";

export const dynamic = "force-dynamic";

/** GET /api/sources: every source with its record count. */
export async function GET(request: Request) {
  const actor = await requestActor(request);
  if (!actor.ok) return errorResponse(actor.error);
  const result = await listSources();
  if (!result.ok) return errorResponse(result.error);
  return NextResponse.json({ sources: result.data });
}

/** POST /api/sources with a source as JSON -> 201 { id, version }; `?allowSameTitle=true` confirms a same-title work. */
export async function POST(request: NextRequest) {
  const actor = await requestActor(request);
  if (!actor.ok) return errorResponse(actor.error);
  const body = await readJson(request);
  if (!body.ok) return errorResponse(body.error);
  const allowSameTitle = request.nextUrl.searchParams.get("allowSameTitle") === "true";
  const result = await createSource(body.body, actor.data, { allowSameTitle });
  if (!result.ok) return errorResponse(result.error);
  return NextResponse.json(result.data, { status: 201, headers: { Location: `/sources/${result.data.id}` } });
}
