"use server";

import { redirect } from "next/navigation";
import { addUser, changeUser } from "@/lib/server/users";
import { actionActor } from "../../_lib/actor";
import type { FormState } from "../../_components/form-result";

/** Adds an account from the form; on success reloads the page naming it. */
export async function addUserAction(_previous: FormState, formData: FormData): Promise<FormState> {
  const actor = await actionActor();
  if (!actor.ok) return { error: actor.error };
  const password = formData.get("password");
  const result = await addUser({ name: formData.get("name"), role: formData.get("role"), ...(typeof password === "string" && password !== "" ? { password } : {}) }, actor.data);
  if (!result.ok) return { error: result.error };
  redirect(`/admin/users?added=${encodeURIComponent(result.data.name)}`);
}

/** Changes one account (role, disabled, password) from its row's form. */
export async function changeUserAction(_previous: FormState, formData: FormData): Promise<FormState> {
  const actor = await actionActor();
  if (!actor.ok) return { error: actor.error };
  const password = formData.get("password");
  const disabled = formData.get("disabled");
  const input = {
    id: formData.get("id"),
    ...(typeof formData.get("role") === "string" && formData.get("role") !== "" ? { role: formData.get("role") } : {}),
    ...(disabled === "true" || disabled === "false" ? { disabled: disabled === "true" } : {}),
    ...(typeof password === "string" && password !== "" ? { password } : {}),
  };
  const result = await changeUser(input, actor.data);
  if (!result.ok) return { error: result.error };
  redirect(`/admin/users?changed=${encodeURIComponent(result.data.name)}`);
}
