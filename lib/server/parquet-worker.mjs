// Worker thread for export Parquet files: takes the writer's options whole (built by
// lib/domain/export/parquet.ts, parquetWriteOptions) and hands the bytes back. Plain JavaScript so
// it starts without a TypeScript loader, under the CLI and under the web server alike.
import { parentPort } from "node:worker_threads";
import { parquetWriteBuffer } from "hyparquet-writer";

parentPort.on("message", ({ id, options }) => {
  try {
    const buffer = parquetWriteBuffer(options);
    parentPort.postMessage({ id, buffer }, [buffer]);
  } catch (error) {
    parentPort.postMessage({ id, error: error instanceof Error ? (error.stack ?? error.message) : String(error) });
  }
});
