import { NextResponse, type NextRequest } from "next/server";
import { createRecord, listRecords } from "@/lib/server/records";
import type { RecordsApiPage } from "../../records/_lib/api-types";
import { queryInputFromParams } from "../../records/_lib/records-url";
import { requestActor } from "../../_lib/actor";
import { errorResponse, readJson } from "../_lib/json";

export const dynamic = "force-dynamic";

/** GET /api/records?alloy=316L,IN718&status=accepted&power_min=100&sort=laserPowerW&direction=desc&page=0&pageSize=100 */
export async function GET(request: NextRequest) {
  const actor = await requestActor(request);
  if (!actor.ok) return errorResponse(actor.error);
  const result = await listRecords(queryInputFromParams(request.nextUrl.searchParams));
  if (!result.ok) return errorResponse(result.error);
  const body: RecordsApiPage = { rows: result.data.rows, total: result.data.total, page: result.data.query.page, pageSize: result.data.query.pageSize };
  return NextResponse.json(body);
}

/** POST /api/records with a record as JSON (the record form's shape) -> 201 { id, version }. */
export async function POST(request: NextRequest) {
  const actor = await requestActor(request);
  if (!actor.ok) return errorResponse(actor.error);
  const body = await readJson(request);
  if (!body.ok) return errorResponse(body.error);
  const result = await createRecord(body.body, actor.data);
  if (!result.ok) return errorResponse(result.error);
  return NextResponse.json(result.data, { status: 201, headers: { Location: `/records/${result.data.id}` } });
}
