import { NextResponse } from "next/server";
import { startImportJob } from "@/lib/server/import-jobs";
import { requestActor } from "../../../_lib/actor";
import { errorResponse, readJson } from "../../_lib/json";

export const dynamic = "force-dynamic";

/** POST /api/imports/jobs: starts the commit of an import; 202 with the job to poll. */
export async function POST(request: Request) {
  const actor = await requestActor(request);
  if (!actor.ok) return errorResponse(actor.error);
  const body = await readJson(request);
  if (!body.ok) return errorResponse(body.error);
  const result = await startImportJob(body.body, actor.data);
  if (!result.ok) return errorResponse(result.error);
  return NextResponse.json(result.data, { status: 202, headers: { Location: `/api/imports/jobs/${result.data.id}` } });
}
