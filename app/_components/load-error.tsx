import type { AppError } from "@/lib/server/result";
import { Alert } from "./alert";

/** A read that failed for a reason other than "not found": say so, keep the page frame. */
export function LoadError({ error, what }: { error: AppError; what: string }) {
  return (
    <Alert tone="error" title={`Could not load ${what}`}>
      <p>{error.message}</p>
    </Alert>
  );
}
