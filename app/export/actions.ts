"use server";

import { redirect } from "next/navigation";
import { createExport, previewExport, rerunExport, type ExportPreview, type ExportRunSummary } from "@/lib/server/exports";
import { actionActor } from "../_lib/actor";
import type { FormError } from "../_components/form-result";

export type ExportFormState = { error: FormError } | { preview: ExportPreview } | { summary: ExportRunSummary } | null;

/** The builder form as an export request (the split from its parts; lists from repeated fields). */
function requestOf(formData: FormData) {
  const text = (k: string) => {
    const v = formData.get(k);
    return typeof v === "string" ? v : undefined;
  };
  const split = text("splitKind") === "folds" ? `folds:${text("folds") ?? ""}` : `source:${text("train") ?? ""},${text("validation") ?? ""},${text("test") ?? ""}`;
  return {
    name: text("name"),
    label: text("label"),
    densityThreshold: text("densityThreshold"),
    balance: text("balance"),
    k: text("k"),
    maxSyntheticMultiple: text("maxSyntheticMultiple"),
    split,
    features: formData.getAll("features").map(String),
    minQuality: text("minQuality"),
    includeUnreviewed: text("includeUnreviewed"),
    alloys: formData.getAll("alloys").map(String),
    sources: formData.getAll("sources").map(String),
    enteredFrom: text("enteredFrom"),
    enteredTo: text("enteredTo"),
    seed: text("seed"),
  };
}

/** Preview (counts and warnings, nothing written) or run (write and save), by the button pressed. */
export async function exportAction(_state: ExportFormState, formData: FormData): Promise<ExportFormState> {
  const request = requestOf(formData);
  if (formData.get("intent") === "preview") {
    const r = await previewExport(request);
    return r.ok ? { preview: r.data } : { error: r.error };
  }
  const actor = await actionActor();
  if (!actor.ok) return { error: actor.error };
  const r = await createExport(request, actor.data);
  return r.ok ? { summary: r.data } : { error: r.error };
}

/** Runs a saved export again and shows the new run. */
export async function rerunExportAction(formData: FormData): Promise<void> {
  const actor = await actionActor();
  const name = String(formData.get("name") ?? "");
  if (!actor.ok) redirect(`/export?error=${encodeURIComponent(actor.error.message)}`);
  const r = await rerunExport(name, actor.data);
  if (!r.ok) redirect(`/export?error=${encodeURIComponent(r.error.message)}`);
  redirect(`/export?run=${encodeURIComponent(r.data.name)}&identical=${r.data.identical ? 1 : 0}&of=${encodeURIComponent(name)}`);
}
