import { NextResponse } from "next/server";
import { assignSourceDoi } from "@/lib/server/citations";
import { requestActor } from "../../../../_lib/actor";
import { errorResponse, readJson } from "../../../_lib/json";

export const dynamic = "force-dynamic";

/** POST /api/sources/:id/doi with { doi }: gives a source without a DOI the one found in its paper. */
export async function POST(request: Request, { params }: { params: Promise<{ id: string }> }) {
  const actor = await requestActor(request);
  if (!actor.ok) return errorResponse(actor.error);
  const { id } = await params;
  const body = await readJson(request);
  if (!body.ok) return errorResponse(body.error);
  const doi = (body.body as { doi?: unknown } | null)?.doi;
  const result = await assignSourceDoi(Number(id), typeof doi === "string" ? doi : "", actor.data);
  if (!result.ok) return errorResponse(result.error);
  return NextResponse.json(result.data);
}
