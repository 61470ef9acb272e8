// Load: concurrent clients against `next start` in team mode on loopback for 30 s, each logged in
// over HTTP (POST /api/session) with a session of its own, browsing record pages and waiving review
// flags through the HTTP API, each pausing as a reader would between requests; then a short run of
// the same clients with no pause, to show where the server saturates. Figures: errors, p50/p95/p99
// latency, and whether every resolution landed exactly once (flag state and audit events checked
// in the database afterwards, by the same SQL on both engines).
//
// Engines (BENCH_LOAD_ENGINES, default "sqlite,postgresql"): SQLite with 50 clients on the seeded
// demo file; PostgreSQL with 100 clients on a throwaway cluster (scripts/test-postgres.sh, stopped
// afterwards) holding the same demo data, moved there with `meltledger db copy`. BENCH_LOAD_CLIENTS
// sets the clients of every engine; BENCH_LOAD_RESOLVE_SHARE the share of waiving requests.
// Traffic goes only to 127.0.0.1 on a port in BENCH_LOAD_PORTS (default 3600-3699); every loop is
// bounded in time and count.
import { execFileSync, spawn, type ChildProcess } from "node:child_process";
import { existsSync, mkdtempSync, rmSync } from "node:fs";
import net from "node:net";
import os from "node:os";
import path from "node:path";
import pg from "pg";
import { openSqlite } from "../lib/db/connection";
import type { DatabaseEngine } from "../lib/db/location";
import { postgresSql, sqliteSql, type SqlDatabase } from "../lib/db/sql";
import { createPrng } from "../seed/prng";
import type { BenchFigure, BenchSuite } from "./types";

const ROOT = path.resolve(import.meta.dirname, "..");
const DEFAULT_CLIENTS: Record<DatabaseEngine, number> = { sqlite: 50, postgresql: 100 };
const DURATION_MS = Number(process.env.BENCH_LOAD_SECONDS ?? 30) * 1000;
/** Upper bound on requests per client, whatever the speed. */
const MAX_REQUESTS_PER_CLIENT = 20_000;
/** Share of a client's requests that try to resolve a flag; the rest browse records. */
const RESOLVE_SHARE = Number(process.env.BENCH_LOAD_RESOLVE_SHARE ?? 0.2);
/**
 * A client pauses between requests as a person reading a page would: uniformly 200–1,000 ms
 * (an assumption of this benchmark, not a measurement). The saturation run that follows uses none.
 */
const THINK_MS: readonly [number, number] = [200, 1000];
const SATURATION_MS = Number(process.env.BENCH_LOAD_SATURATION_SECONDS ?? 10) * 1000;
/** Flags the clients compete for: few enough that several clients often try the same one. */
const FLAG_POOL = 400;
const P95_TARGET_MS = 300;
/** Logins at once while the clients sign in (each is a scrypt check of about 0.26 s). */
const LOGIN_CONCURRENCY = 4;
const PASSWORD = "load-bench-passphrase";

function portRange(): [number, number] {
  const m = /^(\d+)-(\d+)$/.exec(process.env.BENCH_LOAD_PORTS ?? "3600-3699");
  if (!m || Number(m[1]) > Number(m[2])) throw new Error(`BENCH_LOAD_PORTS must be FROM-TO, e.g. 3600-3699 (got ${process.env.BENCH_LOAD_PORTS})`);
  return [Number(m[1]), Number(m[2])];
}

async function freeLoopbackPort(): Promise<number> {
  const [from, to] = portRange();
  for (let port = from; port <= to; port++) {
    const free = await new Promise<boolean>((resolve) => {
      const srv = net.createServer();
      srv.once("error", () => resolve(false));
      srv.listen(port, "127.0.0.1", () => srv.close(() => resolve(true)));
    });
    if (free) return port;
  }
  throw new Error(`no free port in ${from}–${to}`);
}

function percentile(sorted: number[], p: number): number {
  if (!sorted.length) return NaN;
  return sorted[Math.min(sorted.length - 1, Math.floor((p / 100) * sorted.length))]!;
}

const SORTS = ["id", "laserPowerW", "scanSpeedMmPerS", "volumetricEnergyJMm3", "relativeDensityPct"];
const ALLOYS = ["316L", "Ti-6Al-4V", "AlSi10Mg", "IN718"];
const STATUSES = ["needs_review", "accepted", "rejected"];

function engines(): DatabaseEngine[] {
  const list = (process.env.BENCH_LOAD_ENGINES ?? "sqlite,postgresql").split(",").map((s) => s.trim()).filter(Boolean);
  for (const e of list) if (e !== "sqlite" && e !== "postgresql") throw new Error(`BENCH_LOAD_ENGINES: unknown engine "${e}" (sqlite, postgresql)`);
  return list as DatabaseEngine[];
}

/** A throwaway PostgreSQL cluster from scripts/test-postgres.sh; stop() removes it. */
function startCluster(): { url: string; dir: string; stop: () => void } {
  const out = execFileSync("bash", [path.join(ROOT, "scripts/test-postgres.sh"), "start"], { encoding: "utf8", stdio: ["ignore", "pipe", "inherit"] });
  const url = /MELTLEDGER_TEST_PG_URL=(\S+)/.exec(out)?.[1];
  const dir = /MELTLEDGER_TEST_PG_DIR=(\S+)/.exec(out)?.[1];
  if (!url || !dir) throw new Error(`scripts/test-postgres.sh start printed no URL:\n${out}`);
  return { url, dir, stop: () => execFileSync("bash", [path.join(ROOT, "scripts/test-postgres.sh"), "stop", dir], { stdio: "inherit" }) };
}

export const loadBench: BenchSuite = async () => {
  const figures: BenchFigure[] = [];
  for (const engine of engines()) {
    try {
      figures.push(...(await loadOn(engine)));
    } catch (error) {
      // one engine failing (no PostgreSQL installed, say) keeps the other's figures
      process.stderr.write(`[bench] load on ${engine} failed: ${(error as Error).stack}\n`);
      figures.push({ name: `${engine === "sqlite" ? "SQLite" : "PostgreSQL"}: load run`, value: NaN, unit: "", target: "runs", pass: false, notes: `failed: ${(error as Error).message.split("\n")[0]}` });
    }
  }
  return figures;
};

async function loadOn(engine: DatabaseEngine): Promise<BenchFigure[]> {
  const CLIENTS = Number(process.env.BENCH_LOAD_CLIENTS ?? DEFAULT_CLIENTS[engine]);
  const label = engine === "sqlite" ? "SQLite" : "PostgreSQL";
  const dir = mkdtempSync(path.join(os.tmpdir(), "meltledger-bench-load-"));
  const dbFile = path.join(dir, "meltledger.db");
  const base = { ...process.env, NODE_ENV: "production" as const };
  delete (base as Record<string, string | undefined>).MELTLEDGER_MODE;
  const sqliteEnv = { ...base, DATABASE_URL: `file:${dbFile}` };
  const bin = path.join(ROOT, "bin/meltledger.mjs");
  execFileSync(process.execPath, [bin, "db", "migrate"], { env: sqliteEnv, stdio: "pipe" });
  execFileSync(process.execPath, [bin, "db", "seed"], { env: sqliteEnv, stdio: "pipe" });
  let cluster: ReturnType<typeof startCluster> | null = null;
  let env: NodeJS.ProcessEnv = sqliteEnv;
  let db: SqlDatabase | null = null;
  let sqliteReader: ReturnType<typeof openSqlite> | null = null;
  let server: ChildProcess | null = null;
  try {
    if (engine === "postgresql") {
      cluster = startCluster();
      const admin = new pg.Client({ connectionString: cluster.url });
      await admin.connect();
      await admin.query("CREATE DATABASE meltledger_load");
      await admin.end();
      const url = cluster.url.replace(/\/postgres$/, "/meltledger_load");
      const filesDir = path.join(dir, "files-pg");
      execFileSync(process.execPath, [bin, "db", "copy", "--from", `file:${dbFile}`, "--to", url, "--files-to", filesDir, "--json"], { env: sqliteEnv, stdio: "pipe" });
      env = { ...base, DATABASE_URL: url, MELTLEDGER_FILES_DIR: filesDir };
      db = postgresSql(url, { max: 2 });
    } else {
      sqliteReader = openSqlite(dbFile, { readonly: true });
      db = sqliteSql(sqliteReader);
    }
    execFileSync(process.execPath, [bin, "users", "add", "Load Reviewer", "--role", "reviewer", "--password-stdin"], { env, input: `${PASSWORD}\n`, stdio: ["pipe", "pipe", "pipe"] });
    const distDir = process.env.MELTLEDGER_DIST_DIR || ".next";
    if (!existsSync(path.join(ROOT, distDir, "BUILD_ID"))) {
      process.stderr.write(`[bench] load: building into ${distDir} (a few minutes)…\n`);
      execFileSync("npx", ["next", "build"], { cwd: ROOT, env: sqliteEnv, stdio: "inherit" });
    }
    const port = await freeLoopbackPort();
    const origin = `http://127.0.0.1:${port}`;
    let log = "";
    server = spawn(process.execPath, [path.join(ROOT, "node_modules/next/dist/bin/next"), "start", "-p", String(port), "-H", "127.0.0.1"], { cwd: ROOT, env: { ...env, MELTLEDGER_MODE: "team" }, stdio: ["ignore", "pipe", "pipe"] });
    server.stdout?.on("data", (d) => (log += d));
    server.stderr?.on("data", (d) => (log += d));
    const deadline = Date.now() + 60_000;
    for (;;) {
      // team mode: 401 without a session means the server answers
      const up = await fetch(`${origin}/api/records?pageSize=1`).then((r) => r.status === 401, () => false);
      if (up) break;
      if (Date.now() > deadline || server.exitCode !== null) throw new Error(`server did not start:\n${log}`);
      await new Promise((r) => setTimeout(r, 300));
    }

    // every client signs in over HTTP with a session of its own
    const cookies: string[] = new Array<string>(CLIENTS);
    let nextLogin = 0;
    await Promise.all(
      Array.from({ length: LOGIN_CONCURRENCY }, async () => {
        for (let i = nextLogin++; i < CLIENTS; i = nextLogin++) {
          const res = await fetch(`${origin}/api/session`, { method: "POST", headers: { "content-type": "application/json" }, body: JSON.stringify({ name: "Load Reviewer", password: PASSWORD }) });
          const cookie = res.headers.get("set-cookie")?.split(";")[0];
          if (res.status !== 200 || !cookie) throw new Error(`login over HTTP failed: ${res.status} ${await res.text()}`);
          cookies[i] = cookie;
        }
      }),
    );

    const open = await db.all<{ id: number; version: number }>(`SELECT "id", "version" FROM "Flag" WHERE "state" = 'open' ORDER BY "id"`);
    const rng = createPrng(20261201);
    const pool = [...open].sort(() => rng.float(0, 1) - 0.5).slice(0, FLAG_POOL);
    // warm the routes once before timing
    for (let i = 0; i < 10; i++) await fetch(`${origin}/api/records?page=${i}&pageSize=50`, { headers: { cookie: cookies[0]! } }).then((r) => r.arrayBuffer());

    const successes = new Map<number, number>();

    /** One timed run of CLIENTS clients; `think` pauses between a client's requests. */
    async function run(durationMs: number, think: readonly [number, number] | null, seedBase: number) {
      const latencies: number[] = [];
      const browseLatencies: number[] = [];
      const resolveLatencies: number[] = [];
      const errors: string[] = [];
      let conflicts = 0;
      let requests = 0;
      const started = performance.now();
      const end = started + durationMs;
      async function client(seed: number, cookie: string): Promise<void> {
        const r = createPrng(seed);
        // clients start spread over the first pause, not all in the same millisecond
        if (think) await new Promise((res) => setTimeout(res, r.float(0, think[1])));
        for (let n = 0; n < MAX_REQUESTS_PER_CLIENT && performance.now() < end; n++) {
          const resolve = r.float(0, 1) < RESOLVE_SHARE && pool.length > 0;
          const t0 = performance.now();
          try {
            if (resolve) {
              const flag = pool[r.int(0, pool.length - 1)]!;
              const res = await fetch(`${origin}/api/flags/${flag.id}`, {
                method: "POST",
                headers: { "content-type": "application/json", cookie },
                body: JSON.stringify({ version: flag.version, action: "waive", reason: `load test client ${seed}` }),
              });
              await res.arrayBuffer();
              if (res.status === 200) successes.set(flag.id, (successes.get(flag.id) ?? 0) + 1);
              else if (res.status === 409) conflicts++;
              else errors.push(`POST /api/flags/${flag.id}: ${res.status}`);
              resolveLatencies.push(performance.now() - t0);
            } else {
              const q = new URLSearchParams({ page: String(r.int(0, 40)), pageSize: String(r.pick([25, 50, 100])), sort: r.pick(SORTS), direction: r.pick(["asc", "desc"]) });
              if (r.float(0, 1) < 0.5) q.set("alloy", r.pick(ALLOYS));
              if (r.float(0, 1) < 0.3) q.set("status", r.pick(STATUSES));
              if (r.float(0, 1) < 0.2) q.set("power_min", String(r.int(100, 250)));
              const res = await fetch(`${origin}/api/records?${q}`, { headers: { cookie } });
              const text = await res.text();
              // a cheap check of the body, so the client's own parsing does not take the server's CPU
              if (res.status !== 200 || !text.startsWith('{"rows":[')) errors.push(`GET /api/records?${q}: ${res.status}`);
              browseLatencies.push(performance.now() - t0);
            }
          } catch (error) {
            errors.push(`${resolve ? "resolve" : "browse"}: ${(error as Error).message}`);
          }
          latencies.push(performance.now() - t0);
          requests++;
          if (think) await new Promise((res) => setTimeout(res, r.float(think[0], think[1])));
        }
      }
      await Promise.all(Array.from({ length: CLIENTS }, (_, i) => client(seedBase + i, cookies[i]!)));
      const seconds = (performance.now() - started) / 1000;
      const sorted = [...latencies].sort((a, b) => a - b);
      return {
        requests,
        perSecond: requests / seconds,
        errors,
        conflicts,
        p50: percentile(sorted, 50),
        p95: percentile(sorted, 95),
        p99: percentile(sorted, 99),
        browseP95: percentile([...browseLatencies].sort((a, b) => a - b), 95),
        resolveP95: percentile([...resolveLatencies].sort((a, b) => a - b), 95),
        browses: browseLatencies.length,
        resolves: resolveLatencies.length,
      };
    }

    const loadBefore = os.loadavg()[0]!;
    const main = await run(DURATION_MS, THINK_MS, 1000);
    const loadAfter = os.loadavg()[0]!;
    const saturation = SATURATION_MS > 0 ? await run(SATURATION_MS, null, 5000) : null;

    server.kill("SIGTERM");
    await new Promise((r) => setTimeout(r, 500));
    if (server.exitCode === null) server.kill("SIGKILL");
    // the lost-update check reads the database the server wrote, after the server has stopped

    // every 200 must be exactly one state change and one audit event; every flag changed must have
    // had its 200. The same SQL on both engines, in chunks of ids.
    let landedOnce = 0;
    const problems: string[] = [];
    for (let i = 0; i < pool.length; i += 100) {
      const chunk = pool.slice(i, i + 100);
      const rows = await db.all<{ id: number; state: string; audits: number }>(
        `SELECT f."id" AS "id", f."state" AS "state",
                (SELECT COUNT(*) FROM "AuditEvent" a WHERE a."entityType" = 'flag' AND a."entityId" = CAST(f."id" AS TEXT) AND a."action" = 'waive') AS "audits"
           FROM "Flag" f WHERE f."id" IN (${chunk.map(() => "?").join(", ")}) ORDER BY f."id"`,
        chunk.map((f) => f.id),
      );
      if (rows.length !== chunk.length) problems.push(`${chunk.length - rows.length} flag(s) of the pool not found`);
      for (const row of rows) {
        const ok200 = successes.get(row.id) ?? 0;
        if (ok200 === 0 && row.state === "open" && row.audits === 0) continue;
        if (ok200 === 1 && row.state === "waived" && row.audits === 1) landedOnce++;
        else problems.push(`flag ${row.id}: ${ok200} × 200, state ${row.state}, ${row.audits} audit event(s)`);
      }
    }

    const resolved = [...successes.values()].reduce((a, b) => a + b, 0);
    const figures: BenchFigure[] = [
      {
        name: `${label}: errors, ${CLIENTS} clients, each with its own session (team mode), for ${Math.round(DURATION_MS / 1000)} s on loopback, pausing ${THINK_MS[0]}–${THINK_MS[1]} ms between requests (${main.requests} requests, ${main.perSecond.toFixed(0)}/s)`,
        value: main.errors.length,
        unit: "errors",
        target: "0",
        pass: main.errors.length === 0,
        notes: main.errors.length ? main.errors.slice(0, 3).join("; ") : `${main.conflicts} attempts on a flag another client had just resolved got 409, as they should`,
      },
      {
        name: `${label}: p95 latency, all requests`,
        value: main.p95,
        unit: "ms",
        target: `<= ${P95_TARGET_MS}`,
        pass: main.p95 <= P95_TARGET_MS,
        baseline: { name: "p50", value: main.p50, unit: "ms" },
        notes: `p50 ${main.p50.toFixed(0)} ms, p99 ${main.p99.toFixed(0)} ms; load average ${loadBefore.toFixed(1)} before, ${loadAfter.toFixed(1)} after, on ${os.cpus().length} cores; browse p95 ${main.browseP95.toFixed(0)} ms (${main.browses}), resolve p95 ${main.resolveP95.toFixed(0)} ms (${main.resolves})`,
      },
    ];
    if (saturation) {
      figures.push({
        name: `${label}: saturation: the same ${CLIENTS} clients with no pause, ${Math.round(SATURATION_MS / 1000)} s (${saturation.requests} requests, ${saturation.perSecond.toFixed(0)}/s, errors ${saturation.errors.length})`,
        value: saturation.p95,
        unit: "ms p95",
        target: "none (measured: how far past the target a closed loop goes)",
        pass: saturation.errors.length === 0,
        baseline: { name: "p50", value: saturation.p50, unit: "ms" },
        notes: saturation.errors.length ? saturation.errors.slice(0, 3).join("; ") : `browse p95 ${saturation.browseP95.toFixed(0)} ms, resolve p95 ${saturation.resolveP95.toFixed(0)} ms, ${saturation.conflicts} conflicts (409)`,
      });
    }
    figures.push({
      name: `${label}: flag resolutions that landed exactly once (one 200, one state change, one audit event), both runs`,
      value: landedOnce,
      unit: "flags",
      target: `= ${resolved} (every 200)`,
      pass: problems.length === 0 && landedOnce === resolved,
      notes: problems.length ? `lost or doubled (${problems.length}): ${problems.slice(0, 3).join("; ")}` : `${pool.length} flags in play, ${resolved} resolutions; none lost, none doubled`,
    });
    return figures;
  } finally {
    if (server && server.exitCode === null) server.kill("SIGKILL");
    if (db && "pool" in db) await (db as { pool: pg.Pool }).pool.end();
    sqliteReader?.close();
    cluster?.stop();
    rmSync(dir, { recursive: true, force: true });
  }
}
