import { Readable } from "node:stream";
import { openDocument } from "@/lib/server/files";
import { requestActor } from "../../../_lib/actor";
import { errorResponse } from "../../_lib/json";

export const dynamic = "force-dynamic";

/** GET /api/documents/:id: the PDF's bytes, for the viewer (never rendered as anything but a PDF). */
export async function GET(request: Request, { params }: { params: Promise<{ id: string }> }) {
  const actor = await requestActor(request);
  if (!actor.ok) return errorResponse(actor.error);
  const { id } = await params;
  const result = await openDocument(Number(id));
  if (!result.ok) return errorResponse(result.error);
  const { stream, sizeBytes, document } = result.data;
  return new Response(Readable.toWeb(stream) as ReadableStream, {
    headers: {
      "Content-Type": "application/pdf",
      "Content-Length": String(sizeBytes),
      "Content-Disposition": `inline; filename*=UTF-8''${encodeURIComponent(document.fileName)}`,
      "X-Content-Type-Options": "nosniff",
      "Cache-Control": "private, max-age=3600, immutable",
    },
  });
}
