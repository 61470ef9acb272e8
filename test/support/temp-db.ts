import { mkdtempSync, rmSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { closeSqlite } from "@/lib/db/connection";
import { disconnectPrisma } from "@/lib/db/client";

/**
 * Points DATABASE_URL at a fresh temporary SQLite file for one test file.
 * Returns the path and a cleanup function for afterAll.
 */
export function useTempDatabase(label = "test"): { filePath: string; dir: string; cleanup: () => Promise<void> } {
  const dir = mkdtempSync(path.join(os.tmpdir(), `meltledger-${label}-`));
  const filePath = path.join(dir, "meltledger.db");
  process.env.DATABASE_URL = `file:${filePath}`;
  return {
    filePath,
    dir,
    cleanup: async () => {
      await disconnectPrisma();
      closeSqlite();
      rmSync(dir, { recursive: true, force: true });
    },
  };
}
