import { NextResponse } from "next/server";
import { cancelImportJob, getImportJob, type ImportJobView } from "@/lib/server/import-jobs";
import { requestActor } from "../../../../_lib/actor";
import { errorResponse } from "../../../_lib/json";

export const dynamic = "force-dynamic";

type Params = { params: Promise<{ id: string }> };

// the full list of record ids is for the CLI; the page needs counts and the first few
function slim(v: ImportJobView) {
  if (!v.result?.ok) return v;
  const d = v.result.data;
  return { ...v, result: { ok: true, data: { ...d, records: d.records.slice(0, 20), recordCount: d.records.length, errors: d.errors.slice(0, 2000), warnings: d.warnings.slice(0, 2000) } } };
}

/** GET /api/imports/jobs/:id: progress, and the result once finished. */
export async function GET(request: Request, { params }: Params) {
  const actor = await requestActor(request);
  if (!actor.ok) return errorResponse(actor.error);
  const { id } = await params;
  const r = await getImportJob(id);
  return r.ok ? NextResponse.json(slim(r.data)) : errorResponse(r.error);
}

/** DELETE /api/imports/jobs/:id: cancels a running import (it rolls back). */
export async function DELETE(request: Request, { params }: Params) {
  const actor = await requestActor(request);
  if (!actor.ok) return errorResponse(actor.error);
  const { id } = await params;
  const r = await cancelImportJob(id, actor.data);
  return r.ok ? NextResponse.json(slim(r.data)) : errorResponse(r.error);
}
