"use server";

import { redirect } from "next/navigation";
import { actionActor } from "../_lib/actor";
import { createRecord, rejectRecord, updateRecord } from "@/lib/server/records";
import { setFlash } from "../_components/flash";
import type { FormState } from "../_components/form-result";

/** Saves a new record (input in the record form's shape); on success opens its page. */
export async function createRecordAction(input: unknown): Promise<FormState> {
  const actor = await actionActor(input);
  if (!actor.ok) return { error: actor.error };
  const result = await createRecord(input, actor.data);
  if (!result.ok) return { error: result.error };
  await setFlash(`record-${result.data.id}`, "created");
  redirect(`/records/${result.data.id}`);
}

/** Saves an edit when nobody saved the record first; on success opens its page. */
export async function updateRecordAction(input: unknown): Promise<FormState> {
  const actor = await actionActor(input);
  if (!actor.ok) return { error: actor.error };
  const result = await updateRecord(input, actor.data);
  if (!result.ok) return { error: result.error };
  await setFlash(`record-${result.data.id}`, "updated");
  redirect(`/records/${result.data.id}`);
}

/** Rejects a record with a reason (there is no delete); on success reloads its page. */
export async function rejectRecordAction(formData: FormData): Promise<FormState> {
  const input = { id: formData.get("id"), version: formData.get("version"), reason: formData.get("reason") ?? "" };
  const actor = await actionActor();
  if (!actor.ok) return { error: actor.error };
  const result = await rejectRecord(input, actor.data);
  if (!result.ok) return { error: result.error };
  await setFlash(`record-${result.data.id}`, "rejected");
  redirect(`/records/${result.data.id}`);
}
