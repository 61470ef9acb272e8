"use server";

import { actionActor } from "../_lib/actor";
import { acceptRecord, resolveFlag, resolveFlagsBulk } from "@/lib/server/review";

/** What the queue shows after an action: a sentence, or the server's error as it came. */
export type ReviewActionState = { ok: true; message: string } | { ok: false; error: { code: string; message: string; details?: { fieldErrors?: Record<string, string[]> } } };

/** One action on one flag (waive, fix, reject, merge, distinct). */
export async function flagActionAction(input: { flagId: number; version: number; recordVersion: number; action: string; reason: string; fix?: { field: string; value: string; unit: string } | null }): Promise<ReviewActionState> {
  const actor = await actionActor(input);
  if (!actor.ok) return { ok: false, error: actor.error };
  const r = await resolveFlag(input, actor.data);
  if (!r.ok) return { ok: false, error: r.error };
  const d = r.data;
  const verb: Record<string, string> = { waive: "waived", fix: "fixed", reject: "rejected with its record", merge: "merged", distinct: "marked distinct" };
  const message =
    d.action === "fix" && !d.resolved
      ? `Record ${d.recordId}: the value was saved, but the finding of flag ${d.flagId} is still there.`
      : `Flag ${d.flagId} ${verb[d.action] ?? d.action}; record ${d.recordId} is now ${d.recordStatus?.replace("_", " ")}.`;
  return { ok: true, message };
}

/** Accepts a record (refused while an error flag of it is open). */
export async function acceptRecordAction(input: { recordId: number; version: number }): Promise<ReviewActionState> {
  const actor = await actionActor(input);
  if (!actor.ok) return { ok: false, error: actor.error };
  const r = await acceptRecord(input, actor.data);
  if (!r.ok) return { ok: false, error: r.error };
  return { ok: true, message: `Record ${r.data.recordId} accepted${r.data.acceptedFlags ? ` with ${r.data.acceptedFlags} remaining note${r.data.acceptedFlags === 1 ? "" : "s"}` : ""}.` };
}

/** The same action on the selected flags. */
export async function bulkFlagAction(input: { items: { flagId: number; version: number }[]; action: string; reason: string }): Promise<ReviewActionState> {
  const actor = await actionActor(input);
  if (!actor.ok) return { ok: false, error: actor.error };
  const r = await resolveFlagsBulk(input, actor.data);
  if (!r.ok) return { ok: false, error: r.error };
  const failed = r.data.items.filter((i) => !i.ok);
  const message = `${r.data.done} flag${r.data.done === 1 ? "" : "s"} done${failed.length ? `; ${failed.length} not: ${failed.map((f) => `#${f.flagId} (${f.error?.message})`).join(" ")}` : "."}`;
  return failed.length && !r.data.done ? { ok: false, error: { code: "conflict", message } } : { ok: true, message };
}
