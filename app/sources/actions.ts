"use server";

import { redirect } from "next/navigation";
import { actionActor } from "../_lib/actor";
import { createSource, updateSource } from "@/lib/server/sources";
import { setFlash } from "../_components/flash";
import type { FormState } from "../_components/form-result";
import { sourceInputFromFormData } from "./_lib/source-form-data";

/** Creates a source from the form; on success goes to its page. */
export async function createSourceAction(formData: FormData): Promise<FormState> {
  const input = sourceInputFromFormData(formData);
  const actor = await actionActor();
  if (!actor.ok) return { error: actor.error };
  const result = await createSource(input, actor.data, { allowSameTitle: formData.get("allowSameTitle") === "on" });
  if (!result.ok) return { error: result.error };
  await setFlash(`source-${result.data.id}`, "created");
  redirect(`/sources/${result.data.id}`);
}

/** Saves an edit when the version still matches; on success reloads the source page. */
export async function updateSourceAction(formData: FormData): Promise<FormState> {
  const input = sourceInputFromFormData(formData);
  const actor = await actionActor();
  if (!actor.ok) return { error: actor.error };
  const result = await updateSource(input, actor.data);
  if (!result.ok) return { error: result.error };
  await setFlash(`source-${result.data.id}`, "updated");
  redirect(`/sources/${result.data.id}`);
}
