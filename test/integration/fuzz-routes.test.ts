// Property-based fuzzing of every route handler under app/api, every server action under app and
// every use case in lib/server that takes `input: unknown`, plus the table importer: no input may
// give a 500 or an `internal` error, and an input that is refused changes no row of any table.
// Targets are found from the source tree (test/support/fuzz-targets.ts), so new ones are fuzzed too.
// It runs on both engines (describeEachEngine): SQLite with MELTLEDGER_FUZZ_RUNS inputs per target
// (default 200), PostgreSQL with MELTLEDGER_FUZZ_PG_RUNS (default 60, to keep CI's time down); the
// same fixed seed on both, so PostgreSQL sees the first inputs SQLite sees.
import { readdirSync, statSync } from "node:fs";
import path from "node:path";
import fc from "fast-check";
import { NextRequest } from "next/server";
import { beforeAll, describe, expect, test, vi } from "vitest";
import type { DatabaseEngine } from "@/lib/db/location";
import { sql } from "@/lib/db/sql";
import { localActor, type Actor } from "@/lib/server/actor";
import { getImportJob } from "@/lib/server/import-jobs";
import { commitImport, previewImport } from "@/lib/server/imports";
import { runChecks } from "@/lib/server/checks";
import { createRecord } from "@/lib/server/records";
import { createSource } from "@/lib/server/sources";
import { attachPdfToSource } from "@/lib/server/files";
import { csvCell } from "@/lib/domain/suggestions-csv";
import { forbiddenKeyPath } from "@/lib/schemas/plain-input";
import { mixedUnitRecord, sourceInput } from "../support/fixtures";
import { HOSTILE_STRINGS, hostileString, hostileValue, inputFor } from "../support/fuzz-inputs";
import { ROOT, routeFiles, serverActionFiles, untypedUseCases } from "../support/fuzz-targets";
import { inventedPaperPdf } from "../support/pdf";
import { describeEachEngine, type EngineDatabase } from "../support/engines";

// server actions read the request through next/headers: give them a loopback request
const headerState = vi.hoisted(() => ({ headers: new Headers({ host: "127.0.0.1:3000" }) }));
vi.mock("next/headers", () => ({
  headers: async () => headerState.headers,
  cookies: async () => ({ get: () => undefined, set: () => undefined, delete: () => undefined, getAll: () => [], has: () => false }),
}));

process.env.MELTLEDGER_UPLOAD_LIMIT_MB = "1";
const RUNS_OF: Record<DatabaseEngine, number> = {
  sqlite: Number(process.env.MELTLEDGER_FUZZ_RUNS) || 200,
  postgresql: Number(process.env.MELTLEDGER_FUZZ_PG_RUNS) || 60,
};
// a fixed seed keeps CI repeatable; MELTLEDGER_FUZZ_SEED=random (or a number) explores further
const SEED = process.env.MELTLEDGER_FUZZ_SEED === "random" ? Date.now() % 2 ** 31 : Number(process.env.MELTLEDGER_FUZZ_SEED) || 20261201;
fc.configureGlobal({ seed: SEED });

const TABLES = ["User", "Session", "Source", "StoredFile", "SourceDocument", "Material", "MaterialComponent", "BuildRecord", "ImportRun", "MappingPreset", "Flag", "PairDecision", "AuditEvent", "SettingsVersion", "AlloyPropertyOverride", "ExportRun", "SuggestionSet"];
/** Row counts of every table in one statement, through the engine-neutral executor. */
async function counts(): Promise<string> {
  const row = await sql().get<Record<string, number>>(`SELECT ${TABLES.map((t, i) => `(SELECT COUNT(*) FROM "${t}") AS "n${i}"`).join(", ")}`);
  return TABLES.map((_t, i) => Number(row?.[`n${i}`])).join(",");
}

const isRedirect = (e: unknown) => typeof (e as { digest?: unknown })?.digest === "string" && (e as { digest: string }).digest.startsWith("NEXT_REDIRECT");

/** Waits for background import jobs a call may have started, so their writes are not blamed on the next input. */
async function settleJob(body: unknown): Promise<void> {
  const id = (body as { id?: unknown } | null)?.id;
  if (typeof id !== "string") return;
  for (let i = 0; i < 200; i++) {
    const j = await getImportJob(id);
    if (!j.ok || j.data.state === "finished") return;
    await new Promise((r) => setTimeout(r, 25));
  }
}

describeEachEngine("fuzzing", (current: () => EngineDatabase, engine: DatabaseEngine) => {
  let total = 0;
  let started = 0;
  let actor: Actor;
  const ids = { source: 1, record: 1, recordVersion: 1, flag: 1, flagVersion: 1, sourceVersion: 1 };
  const RUNS = RUNS_OF[engine];

  beforeAll(async () => {
    started = performance.now();
    actor = await localActor();
    const s = await createSource(sourceInput({ doi: "10.5555/fuzz.1" }), actor);
    if (!s.ok) throw new Error(s.error.message);
    ids.source = s.data.id;
    ids.sourceVersion = s.data.version;
    for (let i = 0; i < 4; i++) {
      const r = await createRecord(mixedUnitRecord(ids.source, i === 3 ? { laserPower: { value: "1800", unit: "W" } } : {}), actor);
      if (!r.ok) throw new Error(r.error.message);
      ids.record = r.data.id;
      ids.recordVersion = r.data.version;
    }
    await runChecks({ all: true }, actor);
    const flag = await sql().get<{ id: number; version: number }>(`SELECT "id", "version" FROM "Flag" ORDER BY "id" LIMIT 1`);
    if (flag) {
      ids.flag = flag.id;
      ids.flagVersion = flag.version;
    }
    const rec = await sql().get<{ version: number }>(`SELECT "version" FROM "BuildRecord" WHERE "id" = ?`, [ids.record]);
    ids.recordVersion = rec!.version;
    await attachPdfToSource(ids.source, [inventedPaperPdf().pdf], "paper.pdf", actor);
  });

  /** Valid examples per use case or action name, for mutation. */
  function exampleFor(name: string): Record<string, unknown> | null {
    const record = mixedUnitRecord(ids.source) as unknown as Record<string, unknown>;
    const source = sourceInput({ doi: null, title: "A fuzzed invented source" }) as unknown as Record<string, unknown>;
    const table: Record<string, Record<string, unknown>> = {
      createRecord: record,
      updateRecord: { ...record, id: ids.record, version: ids.recordVersion },
      rejectRecord: { id: ids.record, version: ids.recordVersion, reason: "fuzz" },
      listRecords: { page: 0, pageSize: 5, sort: "laserPowerW", direction: "desc" },
      createSource: source,
      updateSource: { ...source, id: ids.source, version: ids.sourceVersion },
      runChecks: { all: false, recordIds: [ids.record] },
      saveCheckSettings: { values: { "range.laserPower.max": "900" }, basedOnVersion: null, reason: "fuzz" },
      resolveFlag: { flagId: ids.flag, version: ids.flagVersion, recordVersion: ids.recordVersion, action: "waive", reason: "fuzz" },
      flagActionAction: { flagId: ids.flag, version: ids.flagVersion, recordVersion: ids.recordVersion, action: "waive", reason: "fuzz" },
      resolveFlagsBulk: { items: [{ flagId: ids.flag, version: ids.flagVersion }], action: "waive", reason: "fuzz" },
      bulkFlagAction: { items: [{ flagId: ids.flag, version: ids.flagVersion }], action: "waive", reason: "fuzz" },
      acceptRecord: { recordId: ids.record, version: ids.recordVersion },
      acceptRecordAction: { recordId: ids.record, version: ids.recordVersion },
      setSourceQualityOverride: { sourceId: ids.source, version: ids.sourceVersion, score: 0.5, reason: "fuzz" },
      listFlags: { state: "open" },
      getReviewQueue: { page: 0 },
      getRecordsBrowser: { page: 0 },
      previewImportRequest: { table: { kind: "paste", text: "Alloy\tPower (W)\tSpeed (mm/s)\n316L\t200\t800" }, mapping: null, sourceId: ids.source },
      startImportJob: { table: { kind: "paste", text: "Alloy\tPower (W)\tSpeed (mm/s)\n316L\t200\t800" }, mapping: null, sourceId: ids.source },
      addUser: { name: "Fuzz Person", role: "contributor" },
      changeUser: { id: 1, role: "admin" },
      login: { name: "local", password: "not-a-password" },
      getCoverage: { alloy: "316L" },
      createSuggestionSet: { alloy: "316L", n: 3, power: "100-300W", speed: "500-1500mm/s", hatch: "100um", layer: "30um", seed: 1 },
      createRecordAction: record,
      updateRecordAction: { ...record, id: ids.record, version: ids.recordVersion },
    };
    return table[name] ?? null;
  }

  /** Error details of a refusal that carry the database's own SQLSTATE (guard()'s net under validation). */
  type Details = { details?: { sqlstate?: unknown } };
  type Outcome = { refused: boolean; status: number; code?: string; body?: unknown; sqlstate?: unknown };

  /**
   * Checks one outcome: no throw but a redirect, no 500, no internal, a refusal writes nothing,
   * and nothing was refused by PostgreSQL itself (a SQLSTATE in the error: validation let through
   * a value SQLite would have taken, so the engines answer differently).
   */
  async function expectSafe(label: string, call: () => Promise<Outcome>): Promise<void> {
    total++;
    const before = await counts();
    let outcome: Outcome;
    try {
      outcome = await call();
    } catch (error) {
      if (isRedirect(error)) return;
      throw new Error(`${label} threw: ${(error as Error).stack}`);
    }
    await settleJob(outcome.body);
    if (outcome.status >= 500 || outcome.code === "internal") throw new Error(`${label}: status ${outcome.status} ${outcome.code ?? ""} ${JSON.stringify(outcome.body)?.slice(0, 400)}`);
    if (outcome.sqlstate !== undefined) throw new Error(`${label}: refused by the database itself (SQLSTATE ${String(outcome.sqlstate)}), not by validation: ${JSON.stringify(outcome.body)?.slice(0, 400)}`);
    if (outcome.refused) {
      const after = await counts();
      if (after !== before) throw new Error(`${label}: refused (${outcome.status} ${outcome.code}) but rows changed: ${before} -> ${after}`);
    }
  }

  // ---------------------------------------------------------------------------------------------
  // HTTP bodies and requests

  const QUERY_KEYS = ["alloy", "sourceId", "status", "outcome", "search", "sort", "direction", "page", "pageSize", "power_min", "power_max", "speed_min", "speed_max", "hatch_min", "layer_max", "ev_min", "density_max", "allowSameTitle", "x"];
  // ids just past PostgreSQL's INTEGER (2^31) and past exact doubles (2^53 + 1) name no row on either engine
const BIG_IDS = ["2147483647", "2147483648", "9007199254740993", "99999999999999999999"];
const queryArb = fc.array(fc.tuple(fc.constantFrom(...QUERY_KEYS), fc.oneof({ weight: 4, arbitrary: hostileString }, { weight: 1, arbitrary: fc.constantFrom(...BIG_IDS) })), { maxLength: 6 });

  const FILE_NAMES = ["paper.pdf", "../../../etc/passwd", "..\\..\\evil.pdf", "/abs/olute.pdf", "con.pdf", "a\u0000b.pdf", "table.csv", "sheet.xlsx", "x".repeat(400) + ".pdf", "<img src=x>.pdf", ".htaccess", "data.tsv"];
  const PDF = inventedPaperPdf().pdf;
  const fileBytes = fc.oneof(
    fc.constant(new Uint8Array(PDF)),
    fc.uint8Array({ maxLength: 2048 }),
    fc.constant(new TextEncoder().encode("Alloy,Power (W),Speed (mm/s)\n316L,200,800\n")),
    fc.constant(new TextEncoder().encode("MZ\u0090\u0000 not a pdf")),
    fc.constant(new Uint8Array([0x50, 0x4b, 0x03, 0x04, 1, 2, 3])),
    fc.constant(new Uint8Array(1024 * 1024 + 10).fill(0x25)), // over the 1 MB limit set above
  );

  type BodySpec = { kind: "none" } | { kind: "json"; value: unknown } | { kind: "text"; text: string; type: string | null } | { kind: "multipart"; name: string; bytes: Uint8Array; field: string } | { kind: "huge" };
  const bodyArb = (example: Record<string, unknown> | null): fc.Arbitrary<BodySpec> =>
    fc.oneof(
      { weight: 60, arbitrary: inputFor(example).map((value) => ({ kind: "json" as const, value })) },
      { weight: 10, arbitrary: fc.constant({ kind: "none" as const }) },
      { weight: 10, arbitrary: fc.record({ kind: fc.constant("text" as const), text: hostileString, type: fc.constantFrom(null, "text/plain", "application/json", "application/x-www-form-urlencoded", "application/xml") }) },
      { weight: 20, arbitrary: fc.record({ kind: fc.constant("multipart" as const), name: fc.oneof(fc.constantFrom(...FILE_NAMES), hostileString), bytes: fileBytes, field: fc.constantFrom("file", "upload", "") }) },
      { weight: 1, arbitrary: fc.constant({ kind: "huge" as const }) },
    );

  function requestOf(method: string, url: string, body: BodySpec): NextRequest {
    const headers = new Headers({ host: "127.0.0.1:3000" });
    let payload: BodyInit | undefined;
    if (method !== "GET" && method !== "HEAD") {
      if (body.kind === "json") {
        headers.set("content-type", "application/json");
        payload = JSON.stringify(body.value) ?? "null";
      } else if (body.kind === "text") {
        if (body.type) headers.set("content-type", body.type);
        payload = body.text;
      } else if (body.kind === "multipart") {
        const form = new FormData();
        if (body.field) form.set(body.field, new File([new Uint8Array(body.bytes)], body.name));
        payload = form;
      } else if (body.kind === "huge") {
        headers.set("content-type", "application/json");
        payload = JSON.stringify({ text: "x".repeat(1_100_000) });
      }
    }
    return new NextRequest(url, { method, headers, body: payload });
  }

  const PARAM_VALUES = fc.oneof(
    fc.constantFrom("1", "2", "3", "999999", "0", "-1", "abc", "1.5", "1e309", "NaN", " 1", "../../etc/passwd", "..%2F..%2Fetc%2Fpasswd", "%00", "00000000-0000-0000-0000-000000000000", ...BIG_IDS),
    hostileString,
  );

  describe("every route handler under app/api", () => {
    const routes = routeFiles();
    test("there are routes to fuzz", () => {
      expect(routes.length).toBeGreaterThanOrEqual(10);
    });

    for (const route of routes) {
      for (const method of route.methods) {
        test(`${method} ${route.pattern}: no 500, no partial write (${RUNS} inputs)`, async () => {
          const mod = (await import(route.file)) as Record<string, (req: NextRequest, ctx: { params: Promise<Record<string, string>> }) => Promise<Response>>;
          const handler = mod[method]!;
          const useCase = route.pattern === "/api/records" ? "createRecord" : route.pattern === "/api/sources" ? "createSource" : route.pattern.includes("imports/preview") || route.pattern.endsWith("imports/jobs") ? "startImportJob" : route.pattern.startsWith("/api/flags/") ? "resolveFlag" : "";
          await fc.assert(
            fc.asyncProperty(fc.array(PARAM_VALUES, { minLength: route.params.length, maxLength: route.params.length }), queryArb, bodyArb(exampleFor(useCase)), async (paramValues, query, body) => {
              const params = Object.fromEntries(route.params.map((p, i) => [p, paramValues[i]!]));
              const concrete = route.pattern.replace(/\[(\w+)\]/g, (_m, p: string) => encodeURIComponent(params[p]!));
              const search = new URLSearchParams(query).toString();
              const url = `http://127.0.0.1:3000${concrete}${search ? `?${search}` : ""}`;
              await expectSafe(`${method} ${url} ${body.kind}`, async () => {
                const res = await handler(requestOf(method, url, body), { params: Promise.resolve(params) });
                const type = res.headers.get("content-type") ?? "";
                const json = type.includes("json") ? ((await res.json()) as { error?: { code?: string } & Details }) : null;
                if (!type.includes("json")) await res.arrayBuffer();
                return { refused: res.status >= 400, status: res.status, code: json?.error?.code, body: json, sqlstate: json?.error?.details?.sqlstate };
              });
            }),
            { numRuns: RUNS },
          );
        });
      }
    }
  });

  describe("every use case in lib/server that takes input: unknown", () => {
    const cases = untypedUseCases();
    test("they are found", () => {
      expect(cases.map((c) => c.name)).toEqual(expect.arrayContaining(["createRecord", "updateRecord", "createSource", "resolveFlag", "addUser"]));
    });
    for (const c of cases) {
      test(`${c.name} (${path.relative(ROOT, c.file)}): never internal, a refusal writes nothing (${RUNS} inputs)`, async () => {
        const mod = (await import(c.file)) as Record<string, (input: unknown, second?: unknown) => Promise<{ ok: boolean; error?: { code: string } & Details; data?: unknown }>>;
        const fn = mod[c.name]!;
        const second = c.second === "actor" ? actor : c.second === "facts" ? { method: "POST", host: "127.0.0.1", origin: null, forwardedFor: null, forwardedProto: null, sessionToken: null } : undefined;
        await fc.assert(
          fc.asyncProperty(inputFor(exampleFor(c.name)), async (input) => {
            // objects carrying toString/valueOf/__proto__ are refused at the edges (readJson, actionActor), which the routes and actions above are fuzzed through
            fc.pre(forbiddenKeyPath(input) === null);
            await expectSafe(`${c.name}(${JSON.stringify(input)?.slice(0, 200)})`, async () => {
              const r = await fn(input, second);
              return { refused: !r.ok, status: r.ok ? 200 : 400, code: r.error?.code, body: r.data ?? r.error, sqlstate: r.error?.details?.sqlstate };
            });
          }),
          { numRuns: RUNS },
        );
      });
    }
  });

  describe("every server action under app", () => {
    for (const f of serverActionFiles()) {
      for (const { name, params } of f.exports) {
        test(`${name} (${path.relative(ROOT, f.file)}): never throws but to redirect, never internal (${RUNS} inputs)`, async () => {
          const mod = (await import(f.file)) as Record<string, (...args: unknown[]) => Promise<unknown>>;
          const action = mod[name]!;
          const formArb = fc.dictionary(fc.oneof(fc.constantFrom("id", "version", "reason", "name", "role", "password", "disabled", "sourceId", "score", "clear", "basedOnVersion", "setting:range.laserPower.max", "next", "title", "kind", "doi", "year", "allowSameTitle"), hostileString), hostileString, { maxKeys: 8, noNullPrototype: true });
          await fc.assert(
            fc.asyncProperty(inputFor(exampleFor(name)), formArb, async (input, fields) => {
              const form = new FormData();
              for (const [k, v] of Object.entries(fields)) form.set(k, v);
              // actions take (input), (formData) or (previousState, formData), as their signature says
              const takesForm = /FormData/.test(params);
              const args = action.length >= 2 ? [null, form] : action.length === 1 ? [takesForm ? form : input] : [];
              await expectSafe(`${name}`, async () => {
                const r = (await action(...args)) as { error?: { code?: string } & Details; ok?: boolean } | null | undefined;
                const code = r?.error?.code;
                return { refused: Boolean(r && (r.error || r.ok === false)), status: code ? 400 : 200, code, body: r?.error, sqlstate: r?.error?.details?.sqlstate };
              });
            }),
            { numRuns: RUNS },
          );
        });
      }
    }
  });

  describe("the table importer", () => {
    const HEADERS = ["Alloy", "Laser power (W)", "Power [kW]", "Scan speed (mm/s)", "Speed", "Hatch (mm)", "Layer (µm)", "Spot (um)", "Outcome", "RD (%)", "DOI", "Page", "=cmd", "../x", ""];
    const tableArb = fc
      .record({
        headers: fc.subarray(HEADERS, { minLength: 1, maxLength: 8 }),
        rows: fc.array(fc.array(fc.oneof(fc.constantFrom("316L", "IN718", "200", "0,8", "1.2", "dense", "LOF", "KH", "", "10.5555/fuzz.1", ...HOSTILE_STRINGS.slice(0, 20)), hostileString), { maxLength: 8 }), { maxLength: 12 }),
        splitter: fc.constantFrom("\t", ",", ";", "   "),
      })
      .map(({ headers, rows, splitter }) => [headers.join(splitter), ...rows.map((r) => r.join(splitter))].join(fc.sample(fc.constantFrom("\n", "\r\n"), 1)[0]));

    test(`previewImport and commitImport of pasted tables: never internal, a refused import writes nothing (${RUNS * 2} inputs)`, async () => {
      await fc.assert(
        fc.asyncProperty(fc.oneof(tableArb, hostileString), fc.boolean(), fc.boolean(), async (text, excludeErrors, commit) => {
          await expectSafe(`import ${JSON.stringify(text).slice(0, 200)}`, async () => {
            const input = { kind: "paste" as const, text, fileName: "fuzz" };
            const options = { mapping: null, sourceId: ids.source, excludeErrors, deferChecks: true };
            const r = commit ? await commitImport(input, options, actor) : await previewImport(input, options);
            return { refused: !r.ok || !commit, status: r.ok ? 200 : 400, code: r.ok ? undefined : r.error.code, body: r.ok ? undefined : r.error, sqlstate: r.ok ? undefined : r.error.details?.sqlstate };
          });
        }),
        { numRuns: RUNS * 2 },
      );
    });
  });

  describe("after the fuzzing", () => {
    // SQLite: at least 10,000 inputs at the default 200 per target; PostgreSQL in proportion to its runs
    const minimum = Number(process.env.MELTLEDGER_FUZZ_MIN) || Math.floor((10_000 * RUNS) / 200);
    test(`at least ${minimum.toLocaleString("en")} generated inputs were tried`, () => {
      console.info(`[fuzz] ${engine}: ${total} generated inputs, ${RUNS} per target (seed ${SEED}), ${((performance.now() - started) / 1000).toFixed(1)} s`);
      expect(total).toBeGreaterThanOrEqual(minimum);
    });

    test("every audit event names its actor", async () => {
      const row = await sql().get<{ n: number }>(`SELECT COUNT(*) AS "n" FROM "AuditEvent" WHERE "actorName" IS NULL OR trim("actorName") = ''`);
      expect(Number(row!.n)).toBe(0);
    });

    test("no file was written outside the database and the content-addressed store (hostile names never reached the file system)", () => {
      const bad: string[] = [];
      const walk = (dir: string) => {
        for (const e of readdirSync(dir)) {
          const p = path.join(dir, e);
          if (statSync(p).isDirectory()) walk(p);
          else {
            const rel = path.relative(root, p).split(path.sep).join("/");
            if (!(current().engine === "sqlite" && /^meltledger\.db(-wal|-shm)?$/.test(rel)) && !/^files\/[0-9a-f]{2}\/[0-9a-f]{64}$/.test(rel)) bad.push(rel);
          }
        }
      };
      // the folder of the SQLite file, or the folder around MELTLEDGER_FILES_DIR beside PostgreSQL
      const root = path.dirname(current().filesDir);
      walk(root);
      expect(bad).toEqual([]);
    });
  });
});

describe("CSV export cells", () => {
  test("CSV cells that start with = + - @ tab or CR are escaped, whatever the text", () => {
    fc.assert(
      fc.property(fc.oneof(hostileString, fc.string()), (text) => {
        const cell = csvCell(text);
        const unquoted = cell.startsWith('"') ? cell.slice(1) : cell;
        expect(/^[=+\-@\t\r]/.test(unquoted)).toBe(false);
      }),
      { numRuns: 2000 },
    );
    void hostileValue;
  });
});
