import { NextResponse } from "next/server";
import { login, logout, requestFactsOf, type SessionCookie } from "@/lib/server/auth";
import { errorResponse, readJson } from "../_lib/json";

export const dynamic = "force-dynamic";

function withCookie(response: NextResponse, cookie: SessionCookie): NextResponse {
  const { name, value, ...options } = cookie;
  response.cookies.set(name, value, options);
  return response;
}

/**
 * POST /api/session with { name, password } (team mode): opens a session for scripts and
 * pipelines, as the login page does — the cookie `meltledger_session` in the answer, the user as
 * JSON. A wrong name or password is a 401; the same lock after five failures applies.
 */
export async function POST(request: Request) {
  const facts = requestFactsOf(request.headers, { method: request.method, url: request.url });
  const body = await readJson(request);
  if (!body.ok) return errorResponse(body.error);
  const r = await login(body.body, facts);
  if (!r.ok) return errorResponse(r.error);
  return withCookie(NextResponse.json({ user: r.data.actor }), r.data.cookie);
}

/** DELETE /api/session: ends the request's session and clears the cookie. */
export async function DELETE(request: Request) {
  const facts = requestFactsOf(request.headers, { method: request.method, url: request.url });
  const r = await logout(facts);
  if (!r.ok) return errorResponse(r.error);
  return withCookie(NextResponse.json({ ended: true }), r.data.cookie);
}
