import { NextResponse } from "next/server";
import { resolveFlag } from "@/lib/server/review";
import { requestActor } from "../../../_lib/actor";
import { errorResponse, readJson } from "../../_lib/json";

export const dynamic = "force-dynamic";

/**
 * POST /api/flags/:id with { version, recordVersion?, action, reason, fix? }: acts on one flag
 * (reviewers). A stale version is a 409 naming who acted, never a second resolution.
 */
export async function POST(request: Request, { params }: { params: Promise<{ id: string }> }) {
  const actor = await requestActor(request);
  if (!actor.ok) return errorResponse(actor.error);
  const { id } = await params;
  const body = await readJson(request);
  if (!body.ok) return errorResponse(body.error);
  const b = body.body !== null && typeof body.body === "object" && !Array.isArray(body.body) ? (body.body as Record<string, unknown>) : {};
  const r = await resolveFlag({ ...b, flagId: id }, actor.data);
  return r.ok ? NextResponse.json(r.data) : errorResponse(r.error);
}
