"use server";

import { redirect } from "next/navigation";
import { actionActor } from "../_lib/actor";
import { saveCheckSettings } from "@/lib/server/check-settings";
import type { FormState } from "../_components/form-result";

/** Saves the settings form as a new version; on success reloads the rules page. */
export async function saveCheckSettingsAction(formData: FormData): Promise<FormState> {
  const values: Record<string, string> = {};
  for (const [key, value] of formData.entries()) if (key.startsWith("setting:") && typeof value === "string") values[key.slice("setting:".length)] = value;
  const actor = await actionActor();
  if (!actor.ok) return { error: actor.error };
  const result = await saveCheckSettings({ values, basedOnVersion: formData.get("basedOnVersion"), reason: formData.get("reason") }, actor.data);
  if (!result.ok) return { error: result.error };
  redirect(`/rules?saved=${result.data.version}#settings`);
}
