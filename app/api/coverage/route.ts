import { NextResponse, type NextRequest } from "next/server";
import { getCoverage } from "@/lib/server/coverage";
import { filtersFromParams, queryInputOf } from "../../coverage/_lib/coverage-url";
import { requestActor } from "../../_lib/actor";
import { errorResponse } from "../_lib/json";

export const dynamic = "force-dynamic";

/** GET /api/coverage?alloy=316L&hatch=80-120um&layer=30um&k=3 -> the coverage report. */
export async function GET(request: NextRequest) {
  const actor = await requestActor(request);
  if (!actor.ok) return errorResponse(actor.error);
  const result = await getCoverage(queryInputOf(filtersFromParams(request.nextUrl.searchParams)));
  if (!result.ok) return errorResponse(result.error);
  return NextResponse.json(result.data);
}
