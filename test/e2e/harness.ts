// Starts the production server on a temporary database and drives Debian's Chromium with
// playwright-core (no browser download).
import { execFileSync, spawn, type ChildProcess } from "node:child_process";
import { existsSync, mkdtempSync, rmSync } from "node:fs";
import net from "node:net";
import os from "node:os";
import path from "node:path";
import { chromium, type Browser } from "playwright-core";

const ROOT = path.resolve(import.meta.dirname, "../..");

export const CHROMIUM_ARGS = [
  "--headless",
  "--no-sandbox",
  "--disable-gpu",
  "--disable-background-networking",
  "--disable-component-update",
  "--disable-sync",
  "--no-first-run",
];

async function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const srv = net.createServer();
    srv.listen(0, "127.0.0.1", () => {
      const { port } = srv.address() as net.AddressInfo;
      srv.close(() => resolve(port));
    });
    srv.on("error", reject);
  });
}

export interface App {
  baseUrl: string;
  dir: string;
  databaseUrl: string;
  browser: Browser;
  stop: () => Promise<void>;
}

/** Migrates (and optionally seeds) a fresh database, starts `next start`, launches Chromium. */
export async function startApp(options: { seed?: boolean } = {}): Promise<App> {
  const dir = mkdtempSync(path.join(os.tmpdir(), "meltledger-e2e-"));
  const databaseUrl = `file:${path.join(dir, "meltledger.db")}`;
  const env = { ...process.env, DATABASE_URL: databaseUrl, NODE_ENV: "production" as const };
  const bin = path.join(ROOT, "bin/meltledger.mjs");
  execFileSync(process.execPath, [bin, "db", "migrate"], { env, stdio: "pipe" });
  if (options.seed) execFileSync(process.execPath, [bin, "db", "seed"], { env, stdio: "pipe" });
  if (!existsSync(path.join(ROOT, process.env.MELTLEDGER_DIST_DIR || ".next", "BUILD_ID"))) execFileSync("npx", ["next", "build"], { cwd: ROOT, env, stdio: "inherit" });
  // MELTLEDGER_E2E_PORT pins the port (e.g. to a range a shared machine sets aside)
  const port = Number(process.env.MELTLEDGER_E2E_PORT) || (await freePort());
  const server: ChildProcess = spawn(process.execPath, [path.join(ROOT, "node_modules/next/dist/bin/next"), "start", "-p", String(port), "-H", "127.0.0.1"], {
    cwd: ROOT,
    env,
    stdio: ["ignore", "pipe", "pipe"],
  });
  let log = "";
  server.stdout?.on("data", (d) => (log += d));
  server.stderr?.on("data", (d) => (log += d));
  const baseUrl = `http://127.0.0.1:${port}`;
  const deadline = Date.now() + 60_000;
  for (;;) {
    try {
      const res = await fetch(baseUrl);
      if (res.ok) break;
    } catch {
      // not listening yet
    }
    if (Date.now() > deadline || server.exitCode !== null) throw new Error(`server did not start:\n${log}`);
    await new Promise((r) => setTimeout(r, 300));
  }
  const browser = await chromium.launch({ executablePath: "/usr/bin/chromium", args: CHROMIUM_ARGS });
  return {
    baseUrl,
    dir,
    databaseUrl,
    browser,
    stop: async () => {
      await browser.close().catch(() => undefined);
      server.kill("SIGTERM");
      await new Promise((r) => setTimeout(r, 300));
      if (server.exitCode === null) server.kill("SIGKILL");
      rmSync(dir, { recursive: true, force: true });
    },
  };
}
