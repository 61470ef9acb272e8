// Finds what the fuzz and role tests drive: every route handler under app/api and every server
// action file under app, so a route or action added later is covered without editing the tests.
import { readdirSync, readFileSync } from "node:fs";
import path from "node:path";

export const ROOT = path.resolve(import.meta.dirname, "../..");

function walk(dir: string, out: string[] = []): string[] {
  for (const e of readdirSync(dir, { withFileTypes: true })) {
    const p = path.join(dir, e.name);
    if (e.isDirectory()) walk(p, out);
    else out.push(p);
  }
  return out;
}

export const HTTP_METHODS = ["GET", "POST", "PUT", "PATCH", "DELETE"] as const;
export type HttpMethod = (typeof HTTP_METHODS)[number];

export interface RouteFile {
  /** The URL path with its dynamic segments, e.g. /api/sources/[id]/documents. */
  pattern: string;
  file: string;
  /** Names of the dynamic segments, in order. */
  params: string[];
  methods: HttpMethod[];
}

/** Every app/api/** /route.ts with the HTTP methods it exports (read from its source). */
export function routeFiles(): RouteFile[] {
  const api = path.join(ROOT, "app", "api");
  return walk(api)
    .filter((f) => f.endsWith(`${path.sep}route.ts`))
    .sort()
    .map((file) => {
      const rel = path.relative(path.join(ROOT, "app"), path.dirname(file)).split(path.sep);
      const src = readFileSync(file, "utf8");
      const methods = HTTP_METHODS.filter((m) => new RegExp(`export\\s+(async\\s+)?function\\s+${m}\\b|export\\s+const\\s+${m}\\b`).test(src));
      return { pattern: `/${rel.join("/")}`, file, params: rel.filter((s) => /^\[.+\]$/.test(s)).map((s) => s.slice(1, -1)), methods };
    });
}

/** Every file under app/ that starts with "use server", with its exported async functions and their parameter lists. */
export function serverActionFiles(): { file: string; exports: { name: string; params: string }[] }[] {
  return walk(path.join(ROOT, "app"))
    .filter((f) => /\.tsx?$/.test(f))
    .map((file) => ({ file, src: readFileSync(file, "utf8") }))
    .filter(({ src }) => /^\s*["']use server["']/.test(src))
    .map(({ file, src }) => ({ file, exports: [...src.matchAll(/export\s+async\s+function\s+(\w+)\(([^)]*)\)/g)].map((m) => ({ name: m[1]!, params: m[2]! })) }))
    .sort((a, b) => a.file.localeCompare(b.file));
}

/** Use cases in lib/server whose first parameter is `input: unknown` (or body/query), with the name of their second parameter. */
export function untypedUseCases(): { file: string; name: string; second: string | null }[] {
  const dir = path.join(ROOT, "lib", "server");
  const out: { file: string; name: string; second: string | null }[] = [];
  for (const file of readdirSync(dir).filter((f) => f.endsWith(".ts") && !f.endsWith(".test.ts")).sort()) {
    const src = readFileSync(path.join(dir, file), "utf8");
    for (const m of src.matchAll(/export\s+async\s+function\s+(\w+)\(\s*(?:input|body|query|raw)\s*:\s*unknown\s*(?:,\s*(\w+)\s*[?]?:)?/g)) {
      out.push({ file: path.join(dir, file), name: m[1]!, second: m[2] ?? null });
    }
  }
  return out;
}
