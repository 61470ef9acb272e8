import { NextResponse } from "next/server";
import { forbiddenKeyPath } from "@/lib/schemas/plain-input";
import { httpStatusOf, type AppError } from "@/lib/server/result";

/** The one error shape of the API: { error: { code, message, details? } } with its HTTP status. */
export function errorResponse(error: AppError): NextResponse {
  return NextResponse.json({ error }, { status: httpStatusOf(error.code) });
}

const MAX_BODY_BYTES = 1_000_000;

/**
 * Reads a JSON body. Bad JSON, a body that is not JSON, an oversized body and an object carrying a
 * key that breaks value conversion (`toString`, `valueOf`, `__proto__`) come back as typed errors
 * (400, 415, 413), never as an exception.
 */
export async function readJson(request: Request): Promise<{ ok: true; body: unknown } | { ok: false; error: AppError }> {
  const type = request.headers.get("content-type") ?? "";
  if (type && !/^application\/(.+\+)?json\b/i.test(type)) {
    return { ok: false, error: { code: "unsupported_type", message: "Send the body as JSON (Content-Type: application/json)." } };
  }
  let text: string;
  try {
    text = await request.text();
  } catch {
    return { ok: false, error: { code: "invalid_input", message: "The request body could not be read." } };
  }
  if (text.length > MAX_BODY_BYTES) return { ok: false, error: { code: "too_large", message: `The body is larger than ${MAX_BODY_BYTES.toLocaleString("en-US")} bytes.` } };
  if (text.trim() === "") return { ok: false, error: { code: "invalid_input", message: "The request body is empty; send a JSON object." } };
  let body: unknown;
  try {
    body = JSON.parse(text) as unknown;
  } catch (e) {
    return { ok: false, error: { code: "invalid_input", message: `The body is not valid JSON: ${(e as Error).message}` } };
  }
  const forbidden = forbiddenKeyPath(body);
  if (forbidden) return { ok: false, error: { code: "invalid_input", message: `The key "${forbidden}" is not allowed in a request body.` } };
  return { ok: true, body };
}
