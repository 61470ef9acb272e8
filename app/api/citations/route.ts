import { NextResponse } from "next/server";
import { lookupDoi, readCitations } from "@/lib/server/citations";
import { requestActor } from "../../_lib/actor";
import { errorResponse, readJson } from "../_lib/json";

export const dynamic = "force-dynamic";

/** POST /api/citations with { text } (BibTeX or RIS) or { doi }: source fields and the existing source each one is. */
export async function POST(request: Request) {
  const actor = await requestActor(request);
  if (!actor.ok) return errorResponse(actor.error);
  const body = await readJson(request);
  if (!body.ok) return errorResponse(body.error);
  const b = (body.body ?? {}) as { text?: unknown; doi?: unknown };
  if (typeof b.doi === "string") {
    const r = await lookupDoi(b.doi);
    return r.ok ? NextResponse.json(r.data) : errorResponse(r.error);
  }
  const r = await readCitations(typeof b.text === "string" ? b.text : "");
  return r.ok ? NextResponse.json(r.data) : errorResponse(r.error);
}
