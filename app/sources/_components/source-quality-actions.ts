"use server";

import { redirect } from "next/navigation";
import { actionActor } from "../../_lib/actor";
import { setSourceQualityOverride } from "@/lib/server/review";
import type { FormState } from "../../_components/form-result";

/** Sets (score given) or clears (score empty) the reviewer's override of a source's quality. */
export async function sourceQualityOverrideAction(formData: FormData): Promise<FormState> {
  const actor = await actionActor();
  if (!actor.ok) return { error: actor.error };
  const sourceId = formData.get("sourceId");
  const result = await setSourceQualityOverride(
    { sourceId, version: formData.get("version"), score: formData.get("clear") === "1" ? null : formData.get("score"), reason: formData.get("reason") },
    actor.data,
  );
  if (!result.ok) return { error: result.error };
  redirect(`/sources/${result.data.sourceId}?saved=quality#quality`);
}
