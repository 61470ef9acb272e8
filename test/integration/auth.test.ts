// Accounts, login, sessions and the two modes, through lib/server and the CLI.
import { execFile } from "node:child_process";
import path from "node:path";
import { afterEach, beforeAll, describe, expect, test } from "vitest";
import { deleteExpiredSessions } from "@/lib/db/sessions";
import { sql } from "@/lib/db/sql";
import { localActor, type Actor } from "@/lib/server/actor";
import { authenticate, gateRequest, login, logout, type RequestFacts } from "@/lib/server/auth";
import { addUser, changeUser, listAccounts } from "@/lib/server/users";
import { describeEachEngine } from "../support/engines";

const BIN = path.resolve(import.meta.dirname, "../../bin/meltledger.mjs");
const facts = (over: Partial<RequestFacts> = {}): RequestFacts => ({ method: "GET", host: "127.0.0.1:3000", origin: null, forwardedFor: null, forwardedProto: null, sessionToken: null, ...over });

describeEachEngine("accounts and sessions", (current) => {
  let admin: Actor;
  // the lock after five failures is kept per process: each engine's block uses its own unknown name
  const nobody = () => `Nobody Here ${current().engine}`;

  beforeAll(async () => {
    admin = await localActor();
    for (const [name, role] of [["Quill Maren", "reviewer"], ["Ossa Bright", "contributor"]] as const) {
      const r = await addUser({ name, role, password: "a-long-test-password" }, admin);
      if (!r.ok) throw new Error(r.error.message);
    }
  });
  afterEach(() => {
    delete process.env.MELTLEDGER_MODE;
  });

  async function loginAs(name: string, password = "a-long-test-password") {
    process.env.MELTLEDGER_MODE = "team";
    const r = await login({ name, password }, facts({ method: "POST" }));
    if (!r.ok) throw new Error(r.error.message);
    return r.data.cookie;
  }

  describe("local mode", () => {
    test("a loopback request is the local admin, with no login", async () => {
      const r = await authenticate(facts());
      expect(r.ok && r.data).toMatchObject({ name: "local", role: "admin" });
    });

    test.each([
      [{ host: "192.168.1.9:3000" }],
      [{ host: "workbench.example" }],
      [{ forwardedFor: "203.0.113.7" }],
      [{ forwardedFor: "127.0.0.1, 198.51.100.2" }],
      // a page on a DNS name rebound to 127.0.0.1 cannot hide its Host behind X-Forwarded-Host
      [{ host: "127.0.0.1:3000", rawHost: "rebound.example:3000" }],
    ])("a request from elsewhere (%j) is refused", async (over) => {
      const r = await authenticate(facts(over));
      expect(!r.ok && r.error.code).toBe("forbidden");
    });

    test("a write sent from another site's page is refused", async () => {
      const r = await authenticate(facts({ method: "POST", origin: "https://evil.example" }));
      expect(!r.ok && r.error.code).toBe("forbidden");
      const same = await authenticate(facts({ method: "POST", origin: "http://127.0.0.1:3000" }));
      expect(same.ok).toBe(true);
    });
  });

  describe("team mode", () => {
    test("no cookie, a malformed cookie and an unknown token are unauthenticated", async () => {
      process.env.MELTLEDGER_MODE = "team";
      for (const sessionToken of [null, "short", "A".repeat(43)]) {
        const r = await authenticate(facts({ sessionToken }));
        expect(!r.ok && r.error.code).toBe("unauthenticated");
      }
    });

    test("login sets an HttpOnly, SameSite=Lax cookie whose token names the user; the database keeps only its hash", async () => {
      const cookie = await loginAs("Quill Maren");
      expect(cookie).toMatchObject({ httpOnly: true, sameSite: "lax", path: "/", secure: false });
      expect(cookie.value).toMatch(/^[A-Za-z0-9_-]{43}$/);
      expect(cookie.expires.getTime()).toBeGreaterThan(Date.now() + 11 * 3_600_000);
      const r = await authenticate(facts({ sessionToken: cookie.value }));
      expect(r.ok && r.data).toMatchObject({ name: "Quill Maren", role: "reviewer" });
      const stored = await sql().all<{ id: string }>(`SELECT "id" FROM "Session" ORDER BY "id"`);
      expect(stored.some((s) => s.id === cookie.value)).toBe(false);
      expect(stored.every((s) => /^[0-9a-f]{64}$/.test(s.id))).toBe(true);
    });

    test("the cookie is Secure when the request came over https", async () => {
      process.env.MELTLEDGER_MODE = "team";
      const r = await login({ name: "Ossa Bright", password: "a-long-test-password" }, facts({ method: "POST", forwardedProto: "https" }));
      expect(r.ok && r.data.cookie.secure).toBe(true);
    });

    test("a session past its expiry is refused", async () => {
      const cookie = await loginAs("Ossa Bright");
      const later = new Date(Date.now() + 13 * 3_600_000);
      const r = await authenticate(facts({ sessionToken: cookie.value }), later);
      expect(!r.ok && r.error.code).toBe("unauthenticated");
    });

    test("expired sessions are removed by instant, live ones kept", async () => {
      const cookie = await loginAs("Quill Maren");
      const before = (await sql().get<{ n: number }>(`SELECT COUNT(*) AS "n" FROM "Session"`))!.n;
      expect(await deleteExpiredSessions(sql(), new Date(Date.now() - 60_000))).toBe(0);
      // every session so far expires 12 h from its login: all of them are gone 13 h from now
      expect(await deleteExpiredSessions(sql(), new Date(Date.now() + 13 * 3_600_000))).toBe(before);
      expect((await authenticate(facts({ sessionToken: cookie.value }))).ok).toBe(false);
    });

    test("a wrong password and an unknown name get the same answer; five failures lock the name", async () => {
      process.env.MELTLEDGER_MODE = "team";
      const wrong = await login({ name: "Ossa Bright", password: "not-the-password" }, facts({ method: "POST" }));
      const unknown = await login({ name: nobody(), password: "not-the-password" }, facts({ method: "POST" }));
      expect(!wrong.ok && wrong.error).toEqual(!unknown.ok && unknown.error);
      for (let i = 0; i < 4; i++) await login({ name: nobody(), password: "x" }, facts({ method: "POST" }));
      const locked = await login({ name: nobody(), password: "x" }, facts({ method: "POST" }));
      expect(!locked.ok && locked.error.message).toMatch(/Too many failed logins/);
    });

    test("an account without a password cannot log in", async () => {
      const r = await addUser({ name: "No Password", role: "contributor" }, admin);
      expect(r.ok).toBe(true);
      process.env.MELTLEDGER_MODE = "team";
      const attempt = await login({ name: "No Password", password: "anything-at-all" }, facts({ method: "POST" }));
      expect(!attempt.ok && attempt.error.code).toBe("unauthenticated");
    });

    test("logout ends the session", async () => {
      const cookie = await loginAs("Quill Maren");
      const out = await logout(facts({ sessionToken: cookie.value }));
      expect(out.ok && out.data.cookie.expires.getTime()).toBe(0);
      const r = await authenticate(facts({ sessionToken: cookie.value }));
      expect(!r.ok && r.error.code).toBe("unauthenticated");
    });

    test("disabling an account ends its sessions; changing a password too; both are audited with the admin's name", async () => {
      const cookie = await loginAs("Ossa Bright");
      const list = await listAccounts(admin);
      const ossa = list.ok ? list.data.find((u) => u.name === "Ossa Bright")! : null;
      const off = await changeUser({ id: ossa!.id, disabled: true }, admin);
      expect(off.ok).toBe(true);
      expect((await authenticate(facts({ sessionToken: cookie.value }))).ok).toBe(false);
      expect((await changeUser({ id: ossa!.id, disabled: false, password: "another-long-password" }, admin)).ok).toBe(true);
      expect((await login({ name: "Ossa Bright", password: "another-long-password" }, facts({ method: "POST" }))).ok).toBe(true);
      const events = await sql().all<{ actorName: string; action: string }>(`SELECT "actorName" AS "actorName", "action" FROM "AuditEvent" WHERE "entityType" = 'user' AND "entityId" = ? ORDER BY "id"`, [String(ossa!.id)]);
      expect(events.map((e) => e.action)).toEqual(["create", "update", "set_password"]);
      expect(events.every((e) => e.actorName === "local")).toBe(true);
    });

    test("the last admin who can log in cannot be demoted or disabled", async () => {
      const r = await addUser({ name: "Sole Admin", role: "admin", password: "a-long-test-password" }, admin);
      expect(r.ok).toBe(true);
      const id = r.ok ? r.data.id : 0;
      const demote = await changeUser({ id, role: "reviewer" }, admin);
      expect(!demote.ok && demote.error.code).toBe("conflict");
    });

    test("only admins manage accounts", async () => {
      const reviewer: Actor = { id: 2, name: "Quill Maren", role: "reviewer" };
      expect((await addUser({ name: "Someone Else", role: "admin", password: "a-long-test-password" }, reviewer)).ok).toBe(false);
      const r = await listAccounts(reviewer);
      expect(!r.ok && r.error.code).toBe("forbidden");
    });

    test("POST /api/session logs in over HTTP (cookie in the answer, usable on the API), a wrong password is a 401, DELETE logs out", async () => {
      process.env.MELTLEDGER_MODE = "team";
      const { NextRequest } = await import("next/server");
      const route = (await import("@/app/api/session/route")) as { POST: (r: Request) => Promise<Response>; DELETE: (r: Request) => Promise<Response> };
      const records = (await import("@/app/api/records/route")) as { GET: (r: InstanceType<typeof NextRequest>) => Promise<Response> };
      const post = (body: unknown) => route.POST(new Request("http://127.0.0.1:3000/api/session", { method: "POST", headers: { host: "127.0.0.1:3000", "content-type": "application/json" }, body: JSON.stringify(body) }));
      const wrong = await post({ name: "Quill Maren", password: "not-the-password" });
      expect(wrong.status).toBe(401);
      expect(wrong.headers.get("set-cookie")).toBeNull();
      const res = await post({ name: "Quill Maren", password: "a-long-test-password" });
      expect(res.status).toBe(200);
      expect(await res.json()).toMatchObject({ user: { name: "Quill Maren", role: "reviewer" } });
      const setCookie = res.headers.get("set-cookie") ?? "";
      expect(setCookie).toMatch(/^meltledger_session=[A-Za-z0-9_-]{43};/);
      expect(setCookie).toMatch(/HttpOnly/i);
      expect(setCookie).toMatch(/SameSite=lax/i);
      const cookie = setCookie.split(";")[0]!;
      const headers = { host: "127.0.0.1:3000", cookie };
      expect((await records.GET(new NextRequest("http://127.0.0.1:3000/api/records?pageSize=1", { headers }))).status).toBe(200);
      expect((await gateRequest(facts({ sessionToken: cookie.split("=")[1]! }), "/api/records")).action).toBe("next");
      const out = await route.DELETE(new Request("http://127.0.0.1:3000/api/session", { method: "DELETE", headers }));
      expect(out.status).toBe(200);
      expect((await records.GET(new NextRequest("http://127.0.0.1:3000/api/records?pageSize=1", { headers }))).status).toBe(401);
    });

    test("the proxy's gate sends pages to the login page, answers 401 to the API and keeps non-admins out of /admin", async () => {
      process.env.MELTLEDGER_MODE = "team";
      expect(await gateRequest(facts(), "/records", "?page=2")).toEqual({ action: "redirect", location: "/login?next=%2Frecords%3Fpage%3D2" });
      const api = await gateRequest(facts(), "/api/records");
      expect(api.action === "deny" && api.error.code).toBe("unauthenticated");
      expect((await gateRequest(facts(), "/login")).action).toBe("next");
      const cookie = await loginAs("Quill Maren");
      expect((await gateRequest(facts({ sessionToken: cookie.value }), "/records")).action).toBe("next");
      const adminPage = await gateRequest(facts({ sessionToken: cookie.value }), "/admin/users");
      expect(adminPage.action === "deny" && adminPage.error.code).toBe("forbidden");
    });
  });

  describe("meltledger users", () => {
    async function cli(args: string[], input?: string): Promise<{ code: number; stdout: string; stderr: string }> {
      return new Promise((resolve) => {
        const child = execFile(process.execPath, [BIN, ...args], { env: { ...process.env, DATABASE_URL: current().url } }, (error, stdout, stderr) =>
          resolve({ code: error ? Number((error as { code?: number }).code ?? 1) : 0, stdout, stderr }),
        );
        child.stdin?.end(input ?? "");
      });
    }

    test("users add NAME --role reviewer --password-stdin creates an account that can log in; users list --json shows it", async () => {
      const added = await cli(["users", "add", "Teodor Vance", "--role", "reviewer", "--password-stdin", "--json"], "cli-given-password\n");
      expect(added.code).toBe(0);
      expect(JSON.parse(added.stdout)).toMatchObject({ name: "Teodor Vance", role: "reviewer" });
      const list = await cli(["users", "list", "--json"]);
      const rows = JSON.parse(list.stdout) as { name: string; role: string; can_log_in: boolean }[];
      expect(rows.find((u) => u.name === "Teodor Vance")).toMatchObject({ role: "reviewer", can_log_in: true });
      expect(list.stdout).not.toMatch(/scrypt/);
      process.env.MELTLEDGER_MODE = "team";
      expect((await login({ name: "Teodor Vance", password: "cli-given-password" }, facts({ method: "POST" }))).ok).toBe(true);
    }, 60_000);

    test("bad usage exits 2 with what to fix", async () => {
      const noRole = await cli(["users", "add", "Someone"]);
      expect(noRole.code).toBe(2);
      expect(noRole.stderr).toMatch(/--role/);
      const badRole = await cli(["users", "add", "Someone", "--role", "owner"]);
      expect(badRole.code).toBe(2);
      const short = await cli(["users", "add", "Someone", "--role", "admin", "--password-stdin"], "short\n");
      expect(short.code).toBe(2);
      expect(short.stderr).toMatch(/at least 10/);
      const taken = await cli(["users", "add", "Teodor Vance", "--role", "admin"]);
      expect(taken.code).toBe(2);
    }, 60_000);
  });
});

describe("request facts", () => {
  test("X-Forwarded-Host is read, and the Host header is kept beside it for the local-mode check", async () => {
    const { requestFactsOf } = await import("@/lib/server/auth");
    const f = requestFactsOf(new Headers({ host: "rebound.example:3000", "x-forwarded-host": "127.0.0.1:3000" }));
    expect(f).toMatchObject({ host: "127.0.0.1:3000", rawHost: "rebound.example:3000" });
    const r = await authenticate(f);
    expect(!r.ok && r.error.code).toBe("forbidden");
  });
});
