// Each role is refused what it may not do, at the route edge and in the use cases, in team mode;
// a refusal writes nothing. Contributors enter and edit; reviewers also resolve flags and accept;
// admins also manage users and settings; without a session nothing but the login page answers.
import { NextRequest } from "next/server";
import { afterAll, beforeAll, describe, expect, test, vi } from "vitest";
import { sql } from "@/lib/db/sql";
import { localActor } from "@/lib/server/actor";
import { gateRequest, login, requestFactsOf } from "@/lib/server/auth";
import { runChecks } from "@/lib/server/checks";
import { createRecord } from "@/lib/server/records";
import { createSource } from "@/lib/server/sources";
import { addUser } from "@/lib/server/users";
import { mixedUnitRecord, sourceInput } from "../support/fixtures";
import { routeFiles } from "../support/fuzz-targets";
import { describeEachEngine } from "../support/engines";

const headerState = vi.hoisted(() => ({ headers: new Headers() }));
vi.mock("next/headers", () => ({
  headers: async () => headerState.headers,
  cookies: async () => ({ get: () => undefined, set: () => undefined, delete: () => undefined, getAll: () => [], has: () => false }),
}));

type Who = "anonymous" | "contributor" | "reviewer" | "admin";
const tokens: Record<Who, string | null> = { anonymous: null, contributor: null, reviewer: null, admin: null };
const ids = { source: 0, sourceVersion: 0, record: 0, recordVersion: 0, flag: 0, flagVersion: 0, user: 0 };

const TABLES = ["User", "Source", "BuildRecord", "Flag", "AuditEvent", "SettingsVersion", "MappingPreset", "SourceDocument", "PairDecision"];
const counts = async () => (await sql().get<Record<string, number>>(`SELECT ${TABLES.map((t) => `(SELECT COUNT(*) FROM "${t}") AS "${t}"`).join(", ")}`))!;
const headersOf = (who: Who) => new Headers({ host: "127.0.0.1:3000", ...(tokens[who] ? { cookie: `meltledger_session=${tokens[who]}` } : {}) });
const isRedirect = (e: unknown) => typeof (e as { digest?: unknown })?.digest === "string" && (e as { digest: string }).digest.startsWith("NEXT_REDIRECT");

describeEachEngine("roles", () => {
  beforeAll(async () => {
    const local = await localActor();
    const s = await createSource(sourceInput({ doi: "10.5555/roles.1" }), local);
    if (!s.ok) throw new Error(s.error.message);
    ids.source = s.data.id;
    ids.sourceVersion = s.data.version;
    await createRecord(mixedUnitRecord(ids.source), local);
    const r = await createRecord(mixedUnitRecord(ids.source, { laserPower: { value: "1800", unit: "W" } }), local);
    if (!r.ok) throw new Error(r.error.message);
    ids.record = r.data.id;
    await runChecks({ all: true }, local);
    const flag = (await sql().get<{ id: number; version: number }>(`SELECT "id", "version" FROM "Flag" WHERE "state" = 'open' ORDER BY "id" LIMIT 1`))!;
    ids.flag = flag.id;
    ids.flagVersion = flag.version;
    ids.recordVersion = (await sql().get<{ version: number }>(`SELECT "version" FROM "BuildRecord" WHERE "id" = ?`, [ids.record]))!.version;
    for (const role of ["contributor", "reviewer", "admin"] as const) {
      const u = await addUser({ name: `Role ${role}`, role, password: "a-long-role-password" }, local);
      if (!u.ok) throw new Error(u.error.message);
      if (role === "contributor") ids.user = u.data.id;
    }
    process.env.MELTLEDGER_MODE = "team";
    for (const role of ["contributor", "reviewer", "admin"] as const) {
      const l = await login({ name: `Role ${role}`, password: "a-long-role-password" }, requestFactsOf(new Headers({ host: "127.0.0.1:3000" }), { method: "POST" }));
      if (!l.ok) throw new Error(l.error.message);
      tokens[role] = l.data.cookie.value;
    }
  });
  afterAll(() => {
    delete process.env.MELTLEDGER_MODE;
  });

  /** Calls a server action as `who`; returns the error code it answered with, "redirect", or "ok". */
  async function act(who: Who, file: string, name: string, ...args: unknown[]): Promise<string> {
    headerState.headers = headersOf(who);
    const mod = (await import(file)) as Record<string, (...a: unknown[]) => Promise<unknown>>;
    try {
      const r = (await mod[name]!(...args)) as { error?: { code: string }; ok?: boolean } | null;
      return r?.error?.code ?? (r?.ok === false ? "failed" : "ok");
    } catch (e) {
      if (isRedirect(e)) return "redirect";
      throw e;
    }
  }

  const form = (fields: Record<string, string>) => {
    const f = new FormData();
    for (const [k, v] of Object.entries(fields)) f.set(k, v);
    return f;
  };

  describe("without a session (team mode)", () => {
    // the viewer's worker is public; POST /api/session is the login itself (auth.test.ts: a wrong password is a 401 there)
    const routes = routeFiles().filter((r) => r.pattern !== "/api/pdf-worker" && r.pattern !== "/api/session");
    for (const route of routes) {
      for (const method of route.methods) {
        test(`${method} ${route.pattern} answers 401 and writes nothing`, async () => {
          const mod = (await import(route.file)) as Record<string, (req: NextRequest, ctx: { params: Promise<Record<string, string>> }) => Promise<Response>>;
          const params = Object.fromEntries(route.params.map((p) => [p, "1"]));
          const url = `http://127.0.0.1:3000${route.pattern.replace(/\[\w+\]/g, "1")}`;
          const init: { method: string; headers: Headers; body?: string } = { method, headers: new Headers({ host: "127.0.0.1:3000", "content-type": "application/json" }) };
          if (method !== "GET") init.body = JSON.stringify(mixedUnitRecord(ids.source));
          const before = await counts();
          const res = await mod[method]!(new NextRequest(url, init), { params: Promise.resolve(params) });
          expect(res.status).toBe(401);
          expect(((await res.json()) as { error: { code: string } }).error.code).toBe("unauthenticated");
          expect(await counts()).toEqual(before);
        });
      }
    }

    test("pages redirect to the login page; the login page itself answers", async () => {
      const facts = requestFactsOf(headersOf("anonymous"), { method: "GET" });
      expect((await gateRequest(facts, "/records")).action).toBe("redirect");
      expect((await gateRequest(facts, "/login")).action).toBe("next");
    });
  });

  // [who, action file, action, args builder, expected answer]
  const MATRIX: [Who, string, string, () => unknown[], "refused" | "allowed"][] = [];
  const FLAG = () => [{ flagId: ids.flag, version: ids.flagVersion, recordVersion: ids.recordVersion, action: "waive", reason: "checked against the paper" }];
  const ACCEPT = () => [{ recordId: ids.record, version: ids.recordVersion }];
  const BULK = () => [{ items: [{ flagId: ids.flag, version: ids.flagVersion }], action: "waive", reason: "checked" }];
  const QUALITY = () => [form({ sourceId: String(ids.source), version: String(ids.sourceVersion), score: "0.5", reason: "checked by hand" })];
  const SETTINGS = () => [form({ "setting:range.laserPower.max": "950", basedOnVersion: "", reason: "machine park" })];
  const ADD_USER = () => [null, form({ name: `Added ${Math.random().toString(36).slice(2, 8)}`, role: "contributor", password: "another-long-password" })];
  const CHANGE_USER = () => [null, form({ id: String(ids.user), role: "reviewer" })];
  const NEW_RECORD = () => [mixedUnitRecord(ids.source, { locationPage: 77 })];
  const NEW_SOURCE = () => [form({ kind: "report", title: `A report ${Math.random()}`, year: "2024", densityMethod: "archimedes", outcomeEvidence: "micrographs" })];

  for (const who of ["anonymous", "contributor", "reviewer", "admin"] as const) {
    const rank = { anonymous: 0, contributor: 1, reviewer: 2, admin: 3 }[who];
    const needs = (min: number) => (rank >= min ? "allowed" : "refused");
    MATRIX.push(
      [who, "records/actions.ts", "createRecordAction", NEW_RECORD, needs(1)],
      [who, "sources/actions.ts", "createSourceAction", NEW_SOURCE, needs(1)],
      [who, "review/actions.ts", "flagActionAction", FLAG, needs(2)],
      [who, "review/actions.ts", "acceptRecordAction", ACCEPT, needs(2)],
      [who, "review/actions.ts", "bulkFlagAction", BULK, needs(2)],
      [who, "sources/_components/source-quality-actions.ts", "sourceQualityOverrideAction", QUALITY, needs(2)],
      [who, "rules/actions.ts", "saveCheckSettingsAction", SETTINGS, needs(3)],
      [who, "admin/users/actions.ts", "addUserAction", ADD_USER, needs(3)],
      [who, "admin/users/actions.ts", "changeUserAction", CHANGE_USER, needs(3)],
    );
  }

  describe("each role is refused what it may not do", () => {
    test.each(MATRIX)("%s: %s › %s is %s", async (who, file, name, args, expected) => {
      const before = await counts();
      const answer = await act(who, `${process.cwd()}/app/${file}`, name, ...args());
      if (expected === "refused") {
        expect(answer).toBe(who === "anonymous" ? "unauthenticated" : "forbidden");
        expect(await counts()).toEqual(before);
      } else {
        // allowed: the role check passed (the use case may still find something else to refuse, e.g. a stale version)
        expect(["unauthenticated", "forbidden"]).not.toContain(answer);
      }
    });

    test.each(["contributor", "reviewer"] as const)("%s is kept out of /admin by the proxy gate; an admin is let in", async (who) => {
      const gate = await gateRequest(requestFactsOf(headersOf(who), { method: "GET" }), "/admin/users");
      expect(gate.action === "deny" && gate.error.code).toBe("forbidden");
      expect((await gateRequest(requestFactsOf(headersOf("admin"), { method: "GET" }), "/admin/users")).action).toBe("next");
    });

    test("a contributor can enter a record through the API and its audit event names them", async () => {
      const mod = (await import(`${process.cwd()}/app/api/records/route.ts`)) as { POST: (r: NextRequest) => Promise<Response> };
      const headers = headersOf("contributor");
      headers.set("content-type", "application/json");
      const res = await mod.POST(new NextRequest("http://127.0.0.1:3000/api/records", { method: "POST", headers, body: JSON.stringify(mixedUnitRecord(ids.source, { locationPage: 88 })) }));
      expect(res.status).toBe(201);
      const { id } = (await res.json()) as { id: number };
      const event = (await sql().get<{ actorName: string }>(`SELECT "actorName" AS "actorName" FROM "AuditEvent" WHERE "entityType" = 'record' AND "entityId" = ? ORDER BY "id" LIMIT 1`, [String(id)]))!;
      expect(event.actorName).toBe("Role contributor");
    });
  });
});
