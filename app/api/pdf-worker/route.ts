import { readPdfWorker } from "@/lib/server/pdf-worker";

// The PDF viewer's worker, served from this server (never from a CDN).
export const dynamic = "force-static";

export async function GET() {
  const code = await readPdfWorker();
  return new Response(code, { headers: { "Content-Type": "text/javascript; charset=utf-8", "Cache-Control": "public, max-age=86400" } });
}
