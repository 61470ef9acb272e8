"use server";

import { cookies, headers } from "next/headers";
import { redirect } from "next/navigation";
import { login, logout, requestFactsOf, safeNextPath } from "@/lib/server/auth";
import type { FormState } from "../_components/form-result";

/** Checks the name and password, sets the session cookie and goes to the page asked for. */
export async function loginAction(_previous: FormState, formData: FormData): Promise<FormState> {
  const facts = requestFactsOf(await headers(), { method: "POST" });
  const result = await login({ name: formData.get("name"), password: formData.get("password") }, facts);
  if (!result.ok) return { error: result.error };
  const { name, value, ...options } = result.data.cookie;
  (await cookies()).set(name, value, options);
  redirect(safeNextPath(formData.get("next")));
}

/** Ends the session and clears its cookie. */
export async function logoutAction(): Promise<void> {
  const facts = requestFactsOf(await headers(), { method: "POST" });
  const result = await logout(facts);
  if (result.ok) {
    const { name, value, ...options } = result.data.cookie;
    (await cookies()).set(name, value, options);
  }
  redirect("/login");
}
