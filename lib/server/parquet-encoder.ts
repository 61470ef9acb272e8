/**
 * Parquet encoding of export tables on a worker thread, so it runs on the second core while the
 * CSV files are written. The worker gets the writer's options exactly as the in-process path
 * would use them, so the bytes are the same; if no worker can be started, encoding happens here.
 */
import { existsSync } from "node:fs";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { Worker } from "node:worker_threads";
import { parquetFromColumns, parquetWriteOptions, type ParquetInput } from "../domain/export/parquet";

const WORKER_FILE = "parquet-worker.mjs";

/** The worker script: beside this module (CLI, tests), or in the project's lib/server (the web server's bundle lives elsewhere). */
function workerPath(): string | null {
  const candidates: string[] = [];
  try {
    candidates.push(path.join(path.dirname(fileURLToPath(import.meta.url)), WORKER_FILE));
  } catch {
    // not a file URL (bundled): only the project folder is left
  }
  candidates.push(path.join(process.cwd(), "lib", "server", WORKER_FILE));
  return candidates.find((p) => existsSync(p)) ?? null;
}

export interface ParquetEncoder {
  encode(input: ParquetInput, createdBy: string): Promise<Uint8Array>;
  /** Ends the worker; encodings still pending are rejected. */
  close(): Promise<void>;
  /** Whether a worker thread does the work (false: in this thread). */
  threaded: boolean;
}

/**
 * An encoder for one export run. Close it when the run is done.
 *
 * @example
 * const encoder = parquetEncoder();
 * try { bytes = await encoder.encode(parquetColumns(columns, table), "meltledger 0.1.0"); } finally { await encoder.close(); }
 */
export function parquetEncoder(): ParquetEncoder {
  const file = workerPath();
  let worker: Worker | null = null;
  if (file) {
    try {
      // Constructed by reflection so the web server's bundler does not try to bundle the worker:
      // it is a plain script, loaded from the project folder at run time.
      worker = Reflect.construct(Worker, [file]) as Worker;
    } catch (error) {
      console.warn(`[meltledger] Parquet worker did not start (${(error as Error).message}); encoding in the main thread`);
    }
  }
  if (!worker) {
    return { threaded: false, encode: async (input, createdBy) => parquetFromColumns(input, createdBy), close: async () => undefined };
  }
  const w = worker;
  const waiting = new Map<number, { resolve: (b: Uint8Array) => void; reject: (e: Error) => void }>();
  let next = 0;
  let failed: Error | null = null;
  const failAll = (error: Error) => {
    failed ??= error;
    for (const p of waiting.values()) p.reject(error);
    waiting.clear();
  };
  w.on("message", (m: { id: number; buffer?: ArrayBuffer; error?: string }) => {
    const p = waiting.get(m.id);
    if (!p) return;
    waiting.delete(m.id);
    if (m.buffer) p.resolve(new Uint8Array(m.buffer));
    else p.reject(new Error(`Parquet encoding failed: ${m.error}`));
  });
  w.on("error", (error) => failAll(error));
  w.on("exit", (code) => failAll(new Error(`the Parquet worker stopped (exit code ${code})`)));
  return {
    threaded: true,
    encode(input, createdBy) {
      if (failed) return Promise.reject(failed);
      const id = next++;
      return new Promise<Uint8Array>((resolve, reject) => {
        waiting.set(id, { resolve, reject });
        w.postMessage({ id, options: parquetWriteOptions(input, createdBy) });
      });
    },
    async close() {
      await w.terminate();
    },
  };
}
