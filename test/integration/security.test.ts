// Uploads at the route edge (not a PDF, too large, hostile names), path traversal, and the
// security headers every response carries.
import path from "node:path";
import fc from "fast-check";
import { parse } from "csv-parse/sync";
import { NextRequest } from "next/server";
import { beforeAll, describe, expect, test } from "vitest";
import { sql } from "@/lib/db/sql";
import { localActor } from "@/lib/server/actor";
import { createSource } from "@/lib/server/sources";
import { sourceInput } from "../support/fixtures";
import { inventedPaperPdf } from "../support/pdf";
import { describeEachEngine } from "../support/engines";
import { writeCsv } from "@/lib/domain/export/csv-writer";
import { HOSTILE_STRINGS } from "../support/fuzz-inputs";
import type { NextConfig } from "next";

const CONFIG_FILE = path.resolve(import.meta.dirname, "../../next.config.mjs");
const loadConfig = async () => (await import(CONFIG_FILE)) as { default: NextConfig; CONTENT_SECURITY_POLICY: string };
process.env.MELTLEDGER_UPLOAD_LIMIT_MB = "1";
type Handler = (req: NextRequest, ctx: { params: Promise<Record<string, string>> }) => Promise<Response>;
const route = async (rel: string) => (await import(path.resolve(import.meta.dirname, "../../app/api", rel, "route.ts"))) as Record<string, Handler>;
const documents = async () => (await sql().get<{ n: number }>(`SELECT COUNT(*) AS "n" FROM "SourceDocument"`))!;

function upload(sourceId: number, name: string, bytes: Uint8Array, type = "application/pdf"): NextRequest {
  const form = new FormData();
  form.set("file", new File([new Uint8Array(bytes)], name, { type }));
  return new NextRequest(`http://127.0.0.1:3000/api/sources/${sourceId}/documents`, { method: "POST", headers: { host: "127.0.0.1:3000" }, body: form });
}

describeEachEngine("uploads and paths", () => {
  let sourceId = 0;
  beforeAll(async () => {
    const s = await createSource(sourceInput({ doi: "10.5555/security.1" }), await localActor());
    if (!s.ok) throw new Error(s.error.message);
    sourceId = s.data.id;
  });

  describe("PDF uploads through the route", () => {
    test.each([
      ["an HTML page named .pdf", new TextEncoder().encode("<html><script>alert(1)</script></html>"), 415],
      ["a ZIP named .pdf", new Uint8Array([0x50, 0x4b, 0x03, 0x04, 0, 0, 0, 0]), 415],
      ["an empty file", new Uint8Array(), 415],
      ["a PDF over the 1 MB limit", new Uint8Array(1024 * 1024 + 100).fill(0x20).map((b, i) => (i < 5 ? "%PDF-".charCodeAt(i) : b)), 413],
    ])("%s is refused and nothing is stored", async (_what, bytes, status) => {
      const { POST } = await route("sources/[id]/documents");
      const before = (await documents()).n;
      const res = await POST!(upload(sourceId, "paper.pdf", bytes), { params: Promise.resolve({ id: String(sourceId) }) });
      expect([status, 400]).toContain(res.status);
      expect((await documents()).n).toBe(before);
    });

    test.each(["../../../../etc/cron.d/evil.pdf", "..\\..\\boot.pdf", "a\u0000b.pdf", "<script>x</script>.pdf"])("a hostile name %j is kept only as a cleaned label; the file is stored by its hash", async (name) => {
      const { POST } = await route("sources/[id]/documents");
      const res = await POST!(upload(sourceId, name, new Uint8Array(inventedPaperPdf().pdf)), { params: Promise.resolve({ id: String(sourceId) }) });
      expect(res.status).toBeLessThan(300);
      const { document } = (await res.json()) as { document: { fileName: string; sha256: string } };
      expect(document.fileName).not.toMatch(/[\\/]/);
      expect(document.fileName.includes("\u0000")).toBe(false);
      expect(document.sha256).toMatch(/^[0-9a-f]{64}$/);
    });
  });

  describe("path traversal", () => {
    test.each(["../../etc/passwd", "..%2F..%2Fetc%2Fpasswd", "1/../../x", "%00", "-1", "1e3"])("GET /api/documents/%s is a 4xx, never a file", async (id) => {
      const { GET } = await route("documents/[id]");
      const res = await GET!(new NextRequest(`http://127.0.0.1:3000/api/documents/${encodeURIComponent(id)}`, { headers: { host: "127.0.0.1:3000" } }), { params: Promise.resolve({ id }) });
      expect(res.status).toBeGreaterThanOrEqual(400);
      expect(res.status).toBeLessThan(500);
      expect(res.headers.get("content-type")).toMatch(/json/);
    });

    test.each(["../../../etc/passwd", "a".repeat(63), "A".repeat(64), `${"0".repeat(62)}/x`])("an import job naming the stored file %j finds nothing", async (sha) => {
      const { POST } = await route("imports/preview");
      const res = await POST!(new NextRequest("http://127.0.0.1:3000/api/imports/preview", { method: "POST", headers: { host: "127.0.0.1:3000", "content-type": "application/json" }, body: JSON.stringify({ table: { kind: "file", sha256: sha, format: "csv", fileName: "x.csv" }, mapping: null }) }), { params: Promise.resolve({}) });
      expect(res.status).toBeGreaterThanOrEqual(400);
      expect(res.status).toBeLessThan(500);
    });
  });
});

describe("security headers", () => {
  test("every path gets CSP with frame-ancestors 'none', nosniff, DENY framing and a referrer policy", async () => {
    const { default: nextConfig, CONTENT_SECURITY_POLICY } = await loadConfig();
    const rules = await nextConfig.headers!();
    const all = rules.find((r) => r.source === "/:path*");
    const byKey = Object.fromEntries((all?.headers ?? []).map((h) => [h.key.toLowerCase(), h.value]));
    expect(byKey["content-security-policy"]).toBe(CONTENT_SECURITY_POLICY);
    expect(byKey["x-content-type-options"]).toBe("nosniff");
    expect(byKey["x-frame-options"]).toBe("DENY");
    expect(byKey["referrer-policy"]).toBe("same-origin");
  });

  test("the policy lets the app and the local pdf.js worker run, and nothing else", async () => {
    const { CONTENT_SECURITY_POLICY } = await loadConfig();
    const directives = Object.fromEntries(CONTENT_SECURITY_POLICY.split(";").map((d: string) => d.trim().split(/\s+/)).map(([k, ...v]) => [k, v]));
    expect(directives["frame-ancestors"]).toEqual(["'none'"]);
    expect(directives["default-src"]).toEqual(["'self'"]);
    expect(directives["worker-src"]).toEqual(["'self'", "blob:"]);
    expect(directives["object-src"]).toEqual(["'none'"]);
    expect(directives["script-src"]).not.toContain("*");
    expect(directives["connect-src"]).toContain("'self'");
  });
});

describe("exports escape formula cells", () => {
  const text = fc.oneof(fc.constantFrom(...HOSTILE_STRINGS), fc.string(), fc.constantFrom("=1+1", "+1", "-1", "@A1", "\t=1", "\r=1", "=cmd|' /C calc'!A0"));
  const FORMULA = /^[=+\-@\t\r]/;

  test("a training-set CSV read back has no text cell a spreadsheet would run, and keeps every value", () => {
    fc.assert(
      fc.property(fc.array(fc.tuple(text, text, fc.double({ noNaN: true, noDefaultInfinity: true })), { minLength: 1, maxLength: 8 }), (rows) => {
        const csv = writeCsv([{ name: "alloy", kind: "text" }, { name: "outcome_text", kind: "text" }, { name: "laser_power_w", kind: "number" }], rows);
        const parsed = parse(csv, { relax_quotes: false }) as string[][];
        expect(parsed).toHaveLength(rows.length + 1);
        parsed.slice(1).forEach((cells, i) => {
          for (const c of [0, 1]) {
            expect(FORMULA.test(cells[c]!)).toBe(false);
            // the guard adds one quote and nothing else
            expect(cells[c] === rows[i]![c] || cells[c] === `'${rows[i]![c]}`).toBe(true);
          }
        });
      }),
      { numRuns: 500 },
    );
  });
});
