// Load: 50 concurrent clients against `next start` on loopback for 30 s, browsing record pages and
// waiving review flags through the HTTP API, each pausing as a reader would between requests; then
// a short run of the same clients with no pause, to show where the server saturates. Figures:
// errors, p95 latency, and whether every resolution landed exactly once (flag state and audit
// events checked in the database afterwards).
// Traffic goes only to 127.0.0.1 on a port in 3600–3699; every loop is bounded in time and count.
import { execFileSync, spawn, type ChildProcess } from "node:child_process";
import { existsSync, mkdtempSync, rmSync } from "node:fs";
import net from "node:net";
import os from "node:os";
import path from "node:path";
import Database from "better-sqlite3";
import { createPrng } from "../seed/prng";
import type { BenchFigure, BenchSuite } from "./types";

const ROOT = path.resolve(import.meta.dirname, "..");
const CLIENTS = Number(process.env.BENCH_LOAD_CLIENTS ?? 50);
const DURATION_MS = Number(process.env.BENCH_LOAD_SECONDS ?? 30) * 1000;
/** Upper bound on requests per client, whatever the speed. */
const MAX_REQUESTS_PER_CLIENT = 20_000;
/** Share of a client's requests that try to resolve a flag; the rest browse records. */
const RESOLVE_SHARE = 0.2;
/**
 * A client pauses between requests as a person reading a page would: uniformly 200–1,000 ms
 * (an assumption of this benchmark, not a measurement). The saturation run that follows uses none.
 */
const THINK_MS: readonly [number, number] = [200, 1000];
const SATURATION_MS = Number(process.env.BENCH_LOAD_SATURATION_SECONDS ?? 10) * 1000;
/** Flags the clients compete for: few enough that several clients often try the same one. */
const FLAG_POOL = 400;
const P95_TARGET_MS = 300;

async function freeLoopbackPort(from = 3600, to = 3699): Promise<number> {
  for (let port = from; port <= to; port++) {
    const free = await new Promise<boolean>((resolve) => {
      const srv = net.createServer();
      srv.once("error", () => resolve(false));
      srv.listen(port, "127.0.0.1", () => srv.close(() => resolve(true)));
    });
    if (free) return port;
  }
  throw new Error("no free port in 3600–3699");
}

function percentile(sorted: number[], p: number): number {
  if (!sorted.length) return NaN;
  return sorted[Math.min(sorted.length - 1, Math.floor((p / 100) * sorted.length))]!;
}

const SORTS = ["id", "laserPowerW", "scanSpeedMmPerS", "volumetricEnergyJMm3", "relativeDensityPct"];
const ALLOYS = ["316L", "Ti-6Al-4V", "AlSi10Mg", "IN718"];
const STATUSES = ["needs_review", "accepted", "rejected"];

export const loadBench: BenchSuite = async () => {
  const dir = mkdtempSync(path.join(os.tmpdir(), "meltledger-bench-load-"));
  const dbFile = path.join(dir, "meltledger.db");
  const env = { ...process.env, DATABASE_URL: `file:${dbFile}`, NODE_ENV: "production" as const };
  delete (env as Record<string, string | undefined>).MELTLEDGER_MODE;
  const bin = path.join(ROOT, "bin/meltledger.mjs");
  execFileSync(process.execPath, [bin, "db", "migrate"], { env, stdio: "pipe" });
  execFileSync(process.execPath, [bin, "db", "seed"], { env, stdio: "pipe" });
  const distDir = process.env.MELTLEDGER_DIST_DIR || ".next";
  if (!existsSync(path.join(ROOT, distDir, "BUILD_ID"))) {
    process.stderr.write(`[bench] load: building into ${distDir} (a few minutes)…\n`);
    execFileSync("npx", ["next", "build"], { cwd: ROOT, env, stdio: "inherit" });
  }
  const port = await freeLoopbackPort();
  const base = `http://127.0.0.1:${port}`;
  let server: ChildProcess | null = null;
  let log = "";
  try {
    server = spawn(process.execPath, [path.join(ROOT, "node_modules/next/dist/bin/next"), "start", "-p", String(port), "-H", "127.0.0.1"], { cwd: ROOT, env, stdio: ["ignore", "pipe", "pipe"] });
    server.stdout?.on("data", (d) => (log += d));
    server.stderr?.on("data", (d) => (log += d));
    const deadline = Date.now() + 60_000;
    for (;;) {
      const up = await fetch(`${base}/api/records?pageSize=1`).then((r) => r.ok, () => false);
      if (up) break;
      if (Date.now() > deadline || server.exitCode !== null) throw new Error(`server did not start:\n${log}`);
      await new Promise((r) => setTimeout(r, 300));
    }

    const listed = (await (await fetch(`${base}/api/flags?state=open`)).json()) as { flags: { id: number; version: number }[] };
    const rng = createPrng(20261201);
    const pool = [...listed.flags].sort(() => rng.float(0, 1) - 0.5).slice(0, FLAG_POOL);
    // warm the routes once before timing
    for (let i = 0; i < 10; i++) await fetch(`${base}/api/records?page=${i}&pageSize=50`).then((r) => r.arrayBuffer());

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
      async function client(seed: number): Promise<void> {
        const r = createPrng(seed);
        // clients start spread over the first pause, not all in the same millisecond
        if (think) await new Promise((res) => setTimeout(res, r.float(0, think[1])));
        for (let n = 0; n < MAX_REQUESTS_PER_CLIENT && performance.now() < end; n++) {
          const resolve = r.float(0, 1) < RESOLVE_SHARE && pool.length > 0;
          const t0 = performance.now();
          try {
            if (resolve) {
              const flag = pool[r.int(0, pool.length - 1)]!;
              const res = await fetch(`${base}/api/flags/${flag.id}`, {
                method: "POST",
                headers: { "content-type": "application/json" },
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
              const res = await fetch(`${base}/api/records?${q}`);
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
      await Promise.all(Array.from({ length: CLIENTS }, (_, i) => client(seedBase + i)));
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

    const main = await run(DURATION_MS, THINK_MS, 1000);
    const saturation = SATURATION_MS > 0 ? await run(SATURATION_MS, null, 5000) : null;

    server.kill("SIGTERM");
    await new Promise((r) => setTimeout(r, 500));
    if (server.exitCode === null) server.kill("SIGKILL");

    // every 200 must be exactly one state change and one audit event; every flag changed must have had its 200
    const db = new Database(dbFile, { readonly: true });
    let landedOnce = 0;
    const problems: string[] = [];
    for (const flag of pool) {
      const row = db.prepare(`SELECT state, version FROM Flag WHERE id = ?`).get(flag.id) as { state: string; version: number };
      const audits = (db.prepare(`SELECT COUNT(*) AS n FROM AuditEvent WHERE entityType = 'flag' AND entityId = ? AND action = 'waive'`).get(String(flag.id)) as { n: number }).n;
      const ok200 = successes.get(flag.id) ?? 0;
      if (ok200 === 0 && row.state === "open" && audits === 0) continue;
      if (ok200 === 1 && row.state === "waived" && audits === 1) landedOnce++;
      else problems.push(`flag ${flag.id}: ${ok200} × 200, state ${row.state}, ${audits} audit event(s)`);
    }
    db.close();

    const resolved = [...successes.values()].reduce((a, b) => a + b, 0);
    const figures: BenchFigure[] = [
      {
        name: `errors, ${CLIENTS} clients for ${Math.round(DURATION_MS / 1000)} s on loopback, pausing ${THINK_MS[0]}–${THINK_MS[1]} ms between requests (${main.requests} requests, ${main.perSecond.toFixed(0)}/s)`,
        value: main.errors.length,
        unit: "errors",
        target: "0",
        pass: main.errors.length === 0,
        notes: main.errors.length ? main.errors.slice(0, 3).join("; ") : `${main.conflicts} attempts on a flag another client had just resolved got 409, as they should`,
      },
      {
        name: "p95 latency, all requests",
        value: main.p95,
        unit: "ms",
        target: `<= ${P95_TARGET_MS}`,
        pass: main.p95 <= P95_TARGET_MS,
        baseline: { name: "p50", value: main.p50, unit: "ms" },
        notes: `browse p95 ${main.browseP95.toFixed(0)} ms (${main.browses}), resolve p95 ${main.resolveP95.toFixed(0)} ms (${main.resolves}), p99 ${main.p99.toFixed(0)} ms`,
      },
    ];
    if (saturation) {
      figures.push({
        name: `saturation: the same ${CLIENTS} clients with no pause, ${Math.round(SATURATION_MS / 1000)} s (${saturation.requests} requests, ${saturation.perSecond.toFixed(0)}/s, errors ${saturation.errors.length})`,
        value: saturation.p95,
        unit: "ms p95",
        target: "none (measured: how far past the target a closed loop goes)",
        pass: saturation.errors.length === 0,
        baseline: { name: "p50", value: saturation.p50, unit: "ms" },
        notes: saturation.errors.length ? saturation.errors.slice(0, 3).join("; ") : `browse p95 ${saturation.browseP95.toFixed(0)} ms, resolve p95 ${saturation.resolveP95.toFixed(0)} ms, ${saturation.conflicts} conflicts (409)`,
      });
    }
    figures.push({
      name: "flag resolutions that landed exactly once (one 200, one state change, one audit event), both runs",
      value: landedOnce,
      unit: "flags",
      target: `= ${resolved} (every 200)`,
      pass: problems.length === 0 && landedOnce === resolved,
      notes: problems.length ? `lost or doubled: ${problems.slice(0, 3).join("; ")}` : `${pool.length} flags in play; none lost, none doubled`,
    });
    return figures;
  } finally {
    if (server && server.exitCode === null) server.kill("SIGKILL");
    rmSync(dir, { recursive: true, force: true });
  }
};
