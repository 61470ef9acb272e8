import { headers } from "next/headers";
import { forbiddenKeyPath } from "@/lib/schemas/plain-input";
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

/**
 * The actor of a server action from the incoming request's headers; same rules as requestActor.
 * Give it the action's arguments: an object carrying `toString`, `valueOf` or `__proto__` (which a
 * crafted request can send) is refused here, before any schema converts values.
 */
export async function actionActor(...inputs: unknown[]): Promise<Result<Actor>> {
  for (const input of inputs) {
    const forbidden = input instanceof FormData ? null : forbiddenKeyPath(input);
    if (forbidden) return { ok: false, error: { code: "invalid_input", message: `The key "${forbidden}" is not allowed in the input.` } };
  }
  return authenticate(requestFactsOf(await headers(), { method: "POST" }));
}

/** The actor of a page render (a GET): used by pages that show who is signed in or gate a section. */
export async function pageActor(): Promise<Result<Actor>> {
  return authenticate(requestFactsOf(await headers(), { method: "GET" }));
}
