// Runs before every page and API request (Next's proxy, Node.js runtime): local mode answers only
// this machine; team mode sends visitors without a session to the login page (pages) or answers
// 401 (API), and keeps non-admins out of /admin. Routes and use cases check again.
import { NextResponse, type NextRequest } from "next/server";
import { gateRequest, requestFactsOf } from "@/lib/server/auth";
import { httpStatusOf } from "@/lib/server/result";

export async function proxy(request: NextRequest) {
  const facts = requestFactsOf(request.headers, { method: request.method, url: request.url });
  const decision = await gateRequest(facts, request.nextUrl.pathname, request.nextUrl.search);
  if (decision.action === "next") return NextResponse.next();
  if (decision.action === "redirect") return NextResponse.redirect(new URL(decision.location, request.url), 303);
  return NextResponse.json({ error: decision.error }, { status: httpStatusOf(decision.error.code) });
}

export const config = {
  // static build output and the icon need no check
  matcher: ["/((?!_next/static|_next/image|icon.svg|favicon.ico).*)"],
};
