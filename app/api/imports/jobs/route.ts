import { NextResponse } from "next/server";
import { localActor } from "@/lib/server/actor";
import { startImportJob } from "@/lib/server/import-jobs";
import { errorResponse, readJson } from "../../_lib/json";

export const dynamic = "force-dynamic";

/** POST /api/imports/jobs: starts the commit of an import; 202 with the job to poll. */
export async function POST(request: Request) {
  const body = await readJson(request);
  if (!body.ok) return errorResponse(body.error);
  const result = await startImportJob(body.body, await localActor());
  if (!result.ok) return errorResponse(result.error);
  return NextResponse.json(result.data, { status: 202, headers: { Location: `/api/imports/jobs/${result.data.id}` } });
}
