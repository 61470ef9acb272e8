/**
 * Who is asking: local mode (one user, no login, loopback only) or team mode (accounts, password
 * login, sessions in a cookie), and the one check every route, server action and the proxy run.
 *
 * Passwords are hashed with scrypt from Node's crypto (OpenSSL), so no native add-on or install
 * script is needed. Parameters: N = 2^17, r = 8, p = 1, 32-byte key, 16-byte random salt — the
 * minimum the OWASP Password Storage Cheat Sheet gives for scrypt (about 0.26 s and 128 MiB per hash
 * on the 2-core development machine). They are stored in the hash string, so they can be raised
 * later without breaking existing passwords.
 *
 * Session tokens are 32 random bytes (base64url) in an HttpOnly, SameSite=Lax cookie (Secure when
 * the request came over https or MELTLEDGER_SECURE_COOKIES=1); the database keeps only their
 * SHA-256, with an expiry (MELTLEDGER_SESSION_HOURS, default 12).
 */
import { createHash, randomBytes, scrypt as scryptCallback, timingSafeEqual, type ScryptOptions } from "node:crypto";
import { z } from "zod";
import { deleteSession, findSessionUser, insertSession } from "../db/sessions";
import { sql } from "../db/sql";
import { getUserCredentials } from "../db/users";
import { loginSchema } from "../schemas/user";
import { localActor, type Actor, type Role, ROLES } from "./actor";
import { isLoopbackHost, serverMode } from "./mode";
import { fail, guard, invalid, nulRefusal, ok, type AppError, type Result } from "./result";

// ---------------------------------------------------------------------------------------------
// Passwords

export interface ScryptParams {
  log2N: number;
  r: number;
  p: number;
  keyLength: number;
  saltLength: number;
}

/** OWASP Password Storage Cheat Sheet, scrypt minimum: N = 2^17, r = 8, p = 1. */
export const SCRYPT_PARAMS: ScryptParams = { log2N: 17, r: 8, p: 1, keyLength: 32, saltLength: 16 };

function scrypt(password: string, salt: Buffer, keyLength: number, options: ScryptOptions): Promise<Buffer> {
  return new Promise((resolve, reject) => scryptCallback(password.normalize("NFC"), salt, keyLength, options, (e, key) => (e ? reject(e) : resolve(key))));
}

const optionsOf = (log2N: number, r: number, p: number): ScryptOptions => ({ N: 2 ** log2N, r, p, maxmem: 256 * 2 ** log2N * r + 1024 * 1024 });

/**
 * Hashes a password as `scrypt$<log2N>$<r>$<p>$<salt b64>$<key b64>`.
 * @example await hashPassword("correct horse battery") // "scrypt$17$8$1$…$…"
 */
export async function hashPassword(password: string, params: ScryptParams = SCRYPT_PARAMS): Promise<string> {
  if (typeof password !== "string" || password.length === 0) throw new TypeError("hashPassword: password must be a non-empty string");
  if (!Number.isInteger(params.log2N) || params.log2N < 14 || params.log2N > 20) throw new RangeError(`hashPassword: log2N ${params.log2N} is outside 14–20`);
  const salt = randomBytes(params.saltLength);
  const key = await scrypt(password, salt, params.keyLength, optionsOf(params.log2N, params.r, params.p));
  return ["scrypt", params.log2N, params.r, params.p, salt.toString("base64"), key.toString("base64")].join("$");
}

const HASH_PATTERN = /^scrypt\$(\d{2})\$(\d{1,2})\$(\d{1,2})\$([A-Za-z0-9+/=]{16,})\$([A-Za-z0-9+/=]{16,})$/;

/** True when `password` matches a hash made by hashPassword; false for any other or malformed hash. Constant-time comparison. */
export async function verifyPassword(password: string, stored: string): Promise<boolean> {
  const m = HASH_PATTERN.exec(stored);
  if (!m || typeof password !== "string") return false;
  const [log2N, r, p] = [Number(m[1]), Number(m[2]), Number(m[3])];
  if (log2N < 14 || log2N > 20 || r < 1 || r > 32 || p < 1 || p > 16) return false;
  const salt = Buffer.from(m[4]!, "base64");
  const expected = Buffer.from(m[5]!, "base64");
  const key = await scrypt(password, salt, expected.length, optionsOf(log2N, r, p));
  return key.length === expected.length && timingSafeEqual(key, expected);
}

// A hash of a random password, so a login for an unknown name costs what a real check costs.
let dummyHash: Promise<string> | null = null;

// ---------------------------------------------------------------------------------------------
// Requests, sessions and the actor

export const SESSION_COOKIE = "meltledger_session";

/** What the auth check reads from a request: the same from a route's Request, next/headers or the proxy. */
export interface RequestFacts {
  method: string;
  /** The Host the client named (X-Forwarded-Host when a proxy set one, else Host). */
  host: string | null;
  /** The Host header itself when X-Forwarded-Host was also given (a browser cannot forge Host, it can add X-Forwarded-Host). */
  rawHost?: string | null;
  origin: string | null;
  forwardedFor: string | null;
  forwardedProto: string | null;
  sessionToken: string | null;
}

/** Anything with `get(name)`: Headers, Next's ReadonlyHeaders. */
export interface HeaderSource {
  get(name: string): string | null;
}

/** Reads the value of one cookie from a Cookie header. */
export function cookieValue(cookieHeader: string | null, name: string): string | null {
  if (!cookieHeader) return null;
  for (const part of cookieHeader.split(";")) {
    const eq = part.indexOf("=");
    if (eq > 0 && part.slice(0, eq).trim() === name) return part.slice(eq + 1).trim() || null;
  }
  return null;
}

/** The facts of a request from its headers (and URL, for a Request built without a Host header). */
export function requestFactsOf(headers: HeaderSource, options: { method?: string; url?: string } = {}): RequestFacts {
  const rawHost = headers.get("host");
  let host = headers.get("x-forwarded-host") ?? rawHost;
  if (!host && options.url) {
    try {
      host = new URL(options.url).host;
    } catch {
      host = null;
    }
  }
  return {
    method: (options.method ?? "GET").toUpperCase(),
    host,
    rawHost,
    origin: headers.get("origin"),
    forwardedFor: headers.get("x-forwarded-for"),
    forwardedProto: headers.get("x-forwarded-proto"),
    sessionToken: cookieValue(headers.get("cookie"), SESSION_COOKIE),
  };
}

const SAFE_METHODS = new Set(["GET", "HEAD", "OPTIONS"]);

/** A write from another site's page (its Origin names another host) is refused in both modes. */
function crossSite(facts: RequestFacts): AppError | null {
  if (SAFE_METHODS.has(facts.method) || !facts.origin) return null;
  let originHost: string;
  try {
    originHost = new URL(facts.origin).host.toLowerCase();
  } catch {
    return { code: "forbidden", message: "The request's Origin header is not a URL; refused." };
  }
  if (facts.origin === "null" || !facts.host || originHost !== facts.host.toLowerCase()) {
    return { code: "forbidden", message: `A change sent from another site (${facts.origin}) is refused.` };
  }
  return null;
}

/** In local mode only requests from this machine are served: Host and every forwarded address must be loopback. */
function notLocal(facts: RequestFacts): AppError | null {
  const forwarded = (facts.forwardedFor ?? "").split(",").map((s) => s.trim()).filter(Boolean);
  // both names must be loopback: a page on a rebound DNS name sends its own Host and may add X-Forwarded-Host
  const hostsLocal = isLoopbackHost(facts.host) && (facts.rawHost == null || isLoopbackHost(facts.rawHost));
  if (hostsLocal && forwarded.every(isLoopbackHost)) return null;
  return {
    code: "forbidden",
    message: "This server runs in local mode (one user, no login) and answers only requests from this machine. To share it, start it in team mode (MELTLEDGER_MODE=team, npm run start:team) with accounts.",
  };
}

const tokenHash = (token: string) => createHash("sha256").update(token).digest("hex");
const TOKEN_PATTERN = /^[A-Za-z0-9_-]{43}$/;

const sessionHoursSchema = z.coerce.number().positive().max(24 * 90);

/** Session lifetime in hours: MELTLEDGER_SESSION_HOURS, default 12 (a working day, common practice). */
export function sessionHours(env: Record<string, string | undefined> = process.env): number {
  const parsed = sessionHoursSchema.safeParse(env.MELTLEDGER_SESSION_HOURS ?? 12);
  return parsed.success ? parsed.data : 12;
}

function isRole(role: string): role is Role {
  return (ROLES as readonly string[]).includes(role);
}

/** The signed-in user of a team-mode session token, or the reason there is none: one indexed read. */
export async function actorOfSessionToken(token: string | null, now: Date = new Date()): Promise<Result<Actor>> {
  if (!token) return fail("unauthenticated", "Log in to continue.");
  if (!TOKEN_PATTERN.test(token)) return fail("unauthenticated", "Your session is not valid; log in again.");
  const row = await findSessionUser(sql(), tokenHash(token));
  if (!row) return fail("unauthenticated", "Your session has ended; log in again.");
  if (Date.parse(row.expiresAt) <= now.getTime()) return fail("unauthenticated", "Your session has expired; log in again.");
  if (row.disabled) return fail("unauthenticated", "This account is disabled.");
  if (!isRole(row.role)) return fail("forbidden", `The account ${row.name} has an unknown role "${row.role}".`);
  return ok({ id: row.userId, name: row.name, role: row.role });
}

/**
 * The actor of a request: the local user in local mode (loopback requests only), the session's
 * user in team mode. Every route handler and server action calls this (through app/_lib/actor.ts)
 * before it calls a use case; the use case then checks the role it needs.
 */
export async function authenticate(facts: RequestFacts, now: Date = new Date()): Promise<Result<Actor>> {
  return guard(async () => {
    const refused = crossSite(facts);
    if (refused) return { ok: false, error: refused };
    if (serverMode().mode === "local") {
      const remote = notLocal(facts);
      if (remote) return { ok: false, error: remote };
      return ok(await localActor());
    }
    return actorOfSessionToken(facts.sessionToken, now);
  });
}

export interface SessionCookie {
  name: string;
  value: string;
  httpOnly: true;
  sameSite: "lax";
  secure: boolean;
  path: "/";
  expires: Date;
}

function isSecure(facts: RequestFacts): boolean {
  return process.env.MELTLEDGER_SECURE_COOKIES === "1" || facts.forwardedProto?.split(",")[0]?.trim() === "https";
}

/** The cookie for a session token (Secure when the request came over https). */
export function sessionCookie(token: string, expires: Date, secure: boolean): SessionCookie {
  return { name: SESSION_COOKIE, value: token, httpOnly: true, sameSite: "lax", secure, path: "/", expires };
}

const MAX_FAILURES = 5;
const LOCK_MS = 60_000;
const failures = new Map<string, { count: number; lockedUntil: number }>();

/**
 * Checks a name and password and opens a session. Wrong name and wrong password give the same
 * message (and take the same time); five failures in a row lock the name for a minute (per process).
 */
export async function login(input: unknown, facts: RequestFacts, now: Date = new Date()): Promise<Result<{ actor: Actor; cookie: SessionCookie }>> {
  return guard(async () => {
    const refused = crossSite(facts);
    if (refused) return { ok: false, error: refused };
    if (serverMode().mode === "local") return fail("invalid_input", "This server runs in local mode: there is nothing to log in to.");
    const nul = nulRefusal(input);
    if (nul) return nul;
    const parsed = loginSchema.safeParse(input);
    if (!parsed.success) return invalid(parsed.error, "Give your user name and password.");
    const { name, password } = parsed.data;
    const key = name.toLowerCase();
    const f = failures.get(key);
    if (f && f.lockedUntil > now.getTime()) return fail("unavailable", `Too many failed logins for this name; try again in ${Math.ceil((f.lockedUntil - now.getTime()) / 1000)} s.`);
    const user = await getUserCredentials(name);
    const hash = user?.passwordHash ?? (await (dummyHash ??= hashPassword(randomBytes(16).toString("hex"))));
    const good = (await verifyPassword(password, hash)) && user !== null && user.passwordHash !== null && !user.disabled && isRole(user.role);
    if (!good || !user) {
      const count = (f?.count ?? 0) + 1;
      failures.set(key, { count, lockedUntil: count >= MAX_FAILURES ? now.getTime() + LOCK_MS : 0 });
      return fail("unauthenticated", "Wrong user name or password, or the account is disabled.", { fieldErrors: { password: ["Wrong user name or password."] } });
    }
    failures.delete(key);
    const token = randomBytes(32).toString("base64url");
    const expires = new Date(now.getTime() + sessionHours() * 3_600_000);
    await insertSession(sql(), { id: tokenHash(token), userId: user.id, createdAt: now, expiresAt: expires });
    return ok({ actor: { id: user.id, name: user.name, role: user.role as Role }, cookie: sessionCookie(token, expires, isSecure(facts)) });
  });
}

/** Ends the request's session (if any) and returns the cookie that clears it. */
export async function logout(facts: RequestFacts): Promise<Result<{ cookie: SessionCookie }>> {
  return guard(async () => {
    if (facts.sessionToken && TOKEN_PATTERN.test(facts.sessionToken)) await deleteSession(sql(), tokenHash(facts.sessionToken));
    return ok({ cookie: sessionCookie("", new Date(0), isSecure(facts)) });
  });
}

// ---------------------------------------------------------------------------------------------
// The proxy's gate: runs before every page and API request

export type GateDecision = { action: "next" } | { action: "redirect"; location: string } | { action: "deny"; error: AppError };

/** Paths anyone may reach in team mode: the login page, its API twin (POST /api/session) and the viewer's static worker. */
const PUBLIC_PATHS = [/^\/login(\/|$)/, /^\/api\/session$/, /^\/api\/pdf-worker$/];
/** Paths only admins may open. */
const ADMIN_PATHS = [/^\/admin(\/|$)/];

/**
 * Decides what happens to a request before it reaches a page or route: in local mode, refuse
 * anything not from this machine; in team mode, send a visitor without a valid session to the
 * login page (pages) or answer 401 (API), and keep non-admins out of /admin. Routes and use cases
 * check again; this is the first line, not the only one.
 */
export async function gateRequest(facts: RequestFacts, pathname: string, search = "", now: Date = new Date()): Promise<GateDecision> {
  const isApi = pathname.startsWith("/api/");
  const refused = crossSite(facts);
  if (refused && isApi) return { action: "deny", error: refused };
  if (serverMode().mode === "local") {
    const remote = notLocal(facts);
    return remote ? { action: "deny", error: remote } : { action: "next" };
  }
  if (PUBLIC_PATHS.some((p) => p.test(pathname))) return { action: "next" };
  let actor: Result<Actor>;
  try {
    actor = await actorOfSessionToken(facts.sessionToken, now);
  } catch (error) {
    console.error("[meltledger] session check failed", error);
    return { action: "deny", error: { code: "unavailable", message: "The session could not be checked; try again in a moment." } };
  }
  if (!actor.ok) {
    if (isApi || facts.method !== "GET") return { action: "deny", error: actor.error };
    return { action: "redirect", location: `/login?next=${encodeURIComponent(pathname + search)}` };
  }
  if (ADMIN_PATHS.some((p) => p.test(pathname)) && actor.data.role !== "admin") {
    return { action: "deny", error: { code: "forbidden", message: `Only admins may open ${pathname}; you are signed in as ${actor.data.role}.` } };
  }
  return { action: "next" };
}

/** A `next` parameter made safe: a path on this site (no scheme, no //host), else "/". */
export function safeNextPath(next: unknown): string {
  // eslint-disable-next-line no-control-regex
  if (typeof next !== "string" || !next.startsWith("/") || next.startsWith("//") || next.startsWith("/\\") || /[\u0000-\u001f]/.test(next)) return "/";
  return next.slice(0, 2000);
}
