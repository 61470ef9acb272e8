import { headers } from "next/headers";
import { authenticate, requestFactsOf } from "@/lib/server/auth";
import type { Actor } from "@/lib/server/actor";
import type { Result } from "@/lib/server/result";

/**
 * The actor of a route handler's request: the local user in local mode, the session's user in team
 * mode, or an `unauthenticated` / `forbidden` error to return as it is (401 / 403).
 */
export function requestActor(request: Request): Promise<Result<Actor>> {
  return authenticate(requestFactsOf(request.headers, { method: request.method, url: request.url }));
}

/** The actor of a server action (or a page) from the incoming request's headers; same rules as requestActor. */
export async function actionActor(): Promise<Result<Actor>> {
  return authenticate(requestFactsOf(await headers(), { method: "POST" }));
}

/** The actor of a page render (a GET): used by pages that show who is signed in or gate a section. */
export async function pageActor(): Promise<Result<Actor>> {
  return authenticate(requestFactsOf(await headers(), { method: "GET" }));
}
