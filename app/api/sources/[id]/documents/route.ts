import { NextResponse } from "next/server";
import { attachPdfToSource, getSourcePapers } from "@/lib/server/files";
import { requestActor } from "../../../../_lib/actor";
import { errorResponse } from "../../../_lib/json";
import { readUpload } from "../../../_lib/upload";

export const dynamic = "force-dynamic";

type Params = { params: Promise<{ id: string }> };

/** GET /api/sources/:id/documents: the source's PDFs and its DOI. */
export async function GET(request: Request, { params }: Params) {
  const actor = await requestActor(request);
  if (!actor.ok) return errorResponse(actor.error);
  const { id } = await params;
  const result = await getSourcePapers(Number(id));
  if (!result.ok) return errorResponse(result.error);
  return NextResponse.json(result.data);
}

/** POST /api/sources/:id/documents with a multipart "file": stores the PDF (once per content) and links it. */
export async function POST(request: Request, { params }: Params) {
  const actor = await requestActor(request);
  if (!actor.ok) return errorResponse(actor.error);
  const { id } = await params;
  const upload = await readUpload(request);
  if (!upload.ok) return errorResponse(upload.error);
  const result = await attachPdfToSource(Number(id), upload.file.stream(), upload.file.name, actor.data);
  if (!result.ok) return errorResponse(result.error);
  return NextResponse.json({ document: result.data }, { status: result.data.alreadyAttached ? 200 : 201 });
}
