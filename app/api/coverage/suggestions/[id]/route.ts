import { NextResponse, type NextRequest } from "next/server";
import { getSuggestionSetView, suggestionSetCsv } from "@/lib/server/suggestions";
import { requestActor } from "../../../../_lib/actor";
import { errorResponse } from "../../../_lib/json";

export const dynamic = "force-dynamic";

/** GET /api/coverage/suggestions/3 -> the set as JSON; ?format=csv -> the CSV for the shop floor. */
export async function GET(request: NextRequest, { params }: { params: Promise<{ id: string }> }) {
  const actor = await requestActor(request);
  if (!actor.ok) return errorResponse(actor.error);
  const { id } = await params;
  const result = await getSuggestionSetView(id);
  if (!result.ok) return errorResponse(result.error);
  if (request.nextUrl.searchParams.get("format") !== "csv") return NextResponse.json(result.data);
  const name = `suggestions-${result.data.alloyKey.replace(/[^A-Za-z0-9_-]+/g, "_")}-set-${result.data.id}.csv`;
  return new NextResponse(suggestionSetCsv(result.data), {
    headers: { "Content-Type": "text/csv; charset=utf-8", "Content-Disposition": `attachment; filename="${name}"` },
  });
}
