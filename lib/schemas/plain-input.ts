/**
 * Keys an input object may not carry. `toString` and `valueOf` as plain values make JavaScript's
 * own number and string conversion throw (zod's `z.coerce` calls it), and `__proto__` is refused as
 * prototype-pollution hardening (OWASP). JSON.parse and server-action decoding can produce all three,
 * so the edges (JSON bodies, server-action arguments) refuse them before any schema runs.
 */
export const FORBIDDEN_INPUT_KEYS: readonly string[] = ["__proto__", "toString", "valueOf"];

/**
 * The path of the first forbidden key in a JSON-like value (depth-first, at most 64 levels and
 * 100,000 nodes looked at), or null when there is none.
 *
 * @example forbiddenKeyPath({ year: { toString: "" } }); // "year.toString"
 * @example forbiddenKeyPath({ year: 2024 }); // null
 */
export function forbiddenKeyPath(value: unknown): string | null {
  let budget = 100_000;
  const walk = (v: unknown, path: string, depth: number): string | null => {
    if (v === null || typeof v !== "object" || depth > 64 || --budget < 0) return null;
    if (Array.isArray(v)) {
      for (let i = 0; i < v.length; i++) {
        const found = walk(v[i], `${path}[${i}]`, depth + 1);
        if (found) return found;
      }
      return null;
    }
    for (const key of Object.keys(v)) {
      const here = path ? `${path}.${key}` : key;
      if (FORBIDDEN_INPUT_KEYS.includes(key)) return here;
      const found = walk((v as Record<string, unknown>)[key], here, depth + 1);
      if (found) return found;
    }
    return null;
  };
  return walk(value, "", 0);
}

/**
 * What a text containing a NUL character is told. PostgreSQL's text types cannot hold U+0000
 * (PostgreSQL documentation, §8.3 Character Types: "the character with code zero … cannot be
 * stored"); SQLite can, so it is refused on both engines alike, before anything is written.
 */
export const NUL_MESSAGE = "Remove the NUL character (\\u0000) from this text: the database cannot store it.";

/**
 * The path of the first string (value or key) containing a NUL character in a JSON-like value
 * (depth-first, the same limits as forbiddenKeyPath; FormData entries by name), "" for a bare
 * string, or null when there is none.
 *
 * @example nulCharacterPath({ title: "a\u0000b" }); // "title"
 * @example nulCharacterPath({ alloy: ["316L", "x\u0000"] }); // "alloy[1]"
 */
export function nulCharacterPath(value: unknown): string | null {
  let budget = 100_000;
  const walk = (v: unknown, path: string, depth: number): string | null => {
    if (typeof v === "string") return v.includes("\u0000") ? path : null;
    if (v === null || typeof v !== "object" || depth > 64 || --budget < 0) return null;
    if (Array.isArray(v)) {
      for (let i = 0; i < v.length; i++) {
        const found = walk(v[i], `${path}[${i}]`, depth + 1);
        if (found !== null) return found;
      }
      return null;
    }
    const entries: [string, unknown][] = typeof FormData !== "undefined" && v instanceof FormData ? [...v.entries()] : Object.entries(v);
    for (const [key, item] of entries) {
      const here = path ? `${path}.${key}` : key;
      if (key.includes("\u0000")) return here;
      const found = walk(item, here, depth + 1);
      if (found !== null) return found;
    }
    return null;
  };
  return walk(value, "", 0);
}
