import { NextResponse, type NextRequest } from "next/server";
import { listImportPresets, saveImportPreset } from "@/lib/server/imports";
import { requestActor } from "../../../_lib/actor";
import { errorResponse, readJson } from "../../_lib/json";

export const dynamic = "force-dynamic";

/** GET /api/imports/presets[?sourceId=N]: named presets and the source's own. */
export async function GET(request: NextRequest) {
  const actor = await requestActor(request);
  if (!actor.ok) return errorResponse(actor.error);
  const raw = request.nextUrl.searchParams.get("sourceId");
  const sourceId = raw && /^\d+$/.test(raw) ? Number(raw) : null;
  const r = await listImportPresets(sourceId);
  return r.ok ? NextResponse.json({ presets: r.data }) : errorResponse(r.error);
}

/** POST /api/imports/presets with { name, sourceId?, mapping }: saves (or replaces) a preset. */
export async function POST(request: Request) {
  const actor = await requestActor(request);
  if (!actor.ok) return errorResponse(actor.error);
  const body = await readJson(request);
  if (!body.ok) return errorResponse(body.error);
  const b = (body.body ?? {}) as { name?: unknown; sourceId?: unknown; mapping?: unknown };
  const r = await saveImportPreset({ name: typeof b.name === "string" ? b.name : "", sourceId: typeof b.sourceId === "number" ? b.sourceId : null, mapping: b.mapping }, actor.data);
  return r.ok ? NextResponse.json({ preset: r.data }, { status: 201 }) : errorResponse(r.error);
}
