import type { Actor } from "@/lib/server/actor";
import { createSource } from "@/lib/server/sources";
import type { SourceInput } from "@/lib/schemas/source";
import { sourceInput } from "./fixtures";

/** Creates an invented source (sourceInput with `overrides`) as `actor` and returns its id; a refusal fails the test. */
export async function newSourceId(actor: Actor, overrides: Partial<SourceInput> = {}): Promise<number> {
  const s = await createSource(sourceInput(overrides), actor);
  if (!s.ok) throw new Error(s.error.message);
  return s.data.id;
}
