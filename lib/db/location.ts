import path from "node:path";
import { z } from "zod";

const envSchema = z.object({
  DATABASE_URL: z.string().trim().min(1).optional(),
  MELTLEDGER_UPLOAD_LIMIT_MB: z.coerce.number().positive().max(2048).optional(),
  NODE_ENV: z.enum(["development", "production", "test"]).optional(),
});

export interface DatabaseLocation {
  /** Absolute path of the SQLite file. */
  filePath: string;
  /** Folder for stored files (content-addressed), next to the database file. */
  dataDir: string;
}

/**
 * Reads DATABASE_URL ("file:./data/meltledger.db" or a plain path; default ./data/meltledger.db)
 * relative to the working directory.
 * @example resolveDatabaseLocation({ DATABASE_URL: "file:/tmp/x.db" }).filePath // "/tmp/x.db"
 */
export function resolveDatabaseLocation(env: NodeJS.ProcessEnv = process.env, cwd = process.cwd()): DatabaseLocation {
  const parsed = envSchema.safeParse(env);
  if (!parsed.success) {
    throw new TypeError(`resolveDatabaseLocation: invalid environment: ${parsed.error.issues.map((i) => `${i.path.join(".")}: ${i.message}`).join("; ")}`);
  }
  const url = parsed.data.DATABASE_URL ?? "file:./data/meltledger.db";
  if (/^postgres(ql)?:\/\//i.test(url)) {
    throw new TypeError("resolveDatabaseLocation: PostgreSQL URLs are not supported by this build; use file:./path.db");
  }
  const raw = url.replace(/^file:(\/\/)?/, "");
  const filePath = path.resolve(cwd, raw);
  return { filePath, dataDir: path.join(path.dirname(filePath), "files") };
}
