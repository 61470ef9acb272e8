"use server";

import { redirect } from "next/navigation";
import { localActor } from "@/lib/server/actor";
import { setSourceQualityOverride } from "@/lib/server/review";
import type { FormState } from "../../_components/form-result";

/** Sets (score given) or clears (score empty) the reviewer's override of a source's quality. */
export async function sourceQualityOverrideAction(formData: FormData): Promise<FormState> {
  const sourceId = formData.get("sourceId");
  const result = await setSourceQualityOverride(
    { sourceId, version: formData.get("version"), score: formData.get("clear") === "1" ? null : formData.get("score"), reason: formData.get("reason") },
    await localActor(),
  );
  if (!result.ok) return { error: result.error };
  redirect(`/sources/${result.data.sourceId}?saved=quality#quality`);
}
