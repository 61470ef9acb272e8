import { readFile } from "node:fs/promises";
import path from "node:path";

let cached: Promise<string> | null = null;

/** The pdf.js worker script from the installed pdfjs-dist, read once. */
export function readPdfWorker(): Promise<string> {
  cached ??= readFile(path.join(process.cwd(), "node_modules", "pdfjs-dist", "build", "pdf.worker.min.mjs"), "utf8");
  return cached;
}
