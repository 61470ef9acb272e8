// Runs the real `meltledger` command in a child process against one test database.
import { execFile } from "node:child_process";
import path from "node:path";
import { promisify } from "node:util";

const run = promisify(execFile);
const BIN = path.resolve(import.meta.dirname, "../../bin/meltledger.mjs");

export interface CliRun {
  code: number;
  stdout: string;
  stderr: string;
}

/**
 * A `cli(...args)` function bound to the SQLite file `database` (or the database a postgresql://
 * URL names); it never throws on a non-zero exit.
 */
export function cliFor(database: string): (...args: string[]) => Promise<CliRun> {
  const url = /^postgres(ql)?:\/\//.test(database) ? database : `file:${database}`;
  return async (...args) => {
    try {
      const { stdout, stderr } = await run(process.execPath, [BIN, ...args], { env: { ...process.env, DATABASE_URL: url }, maxBuffer: 64 * 1024 * 1024 });
      return { code: 0, stdout, stderr };
    } catch (error) {
      const e = error as CliRun;
      return { code: e.code, stdout: e.stdout, stderr: e.stderr };
    }
  };
}
