import { NextResponse, type NextRequest } from "next/server";
import { listFlags } from "@/lib/server/flags";
import { requestActor } from "../../_lib/actor";
import { errorResponse } from "../_lib/json";

export const dynamic = "force-dynamic";

/** GET /api/flags?state=open&record=ID&source=ID&code=PREFIX&severity=error: every matching flag. */
export async function GET(request: NextRequest) {
  const actor = await requestActor(request);
  if (!actor.ok) return errorResponse(actor.error);
  const p = request.nextUrl.searchParams;
  const r = await listFlags({ state: p.get("state"), recordId: p.get("record"), sourceId: p.get("source"), codePrefix: p.get("code"), severity: p.get("severity") });
  return r.ok ? NextResponse.json({ flags: r.data }) : errorResponse(r.error);
}
