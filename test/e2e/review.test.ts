// The review queue worked with the keyboard only: three flags of the seeded demo resolved (a
// duplicate merged, a flag waived, a record rejected), each audited, without touching the mouse.
import { execFileSync } from "node:child_process";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, test } from "vitest";
import type { Page } from "playwright-core";
import { startApp, type App } from "./harness";

const BIN = path.resolve(import.meta.dirname, "../../bin/meltledger.mjs");
let app: App;
let page: Page;

interface FlagJson { id: number; record_id: number; code: string; state: string; resolution: string | null; reason: string | null; resolved_by: string | null }

function flags(...args: string[]): FlagJson[] {
  const out = execFileSync(process.execPath, [BIN, "flags", "list", "--json", ...args], { env: { ...process.env, DATABASE_URL: app.databaseUrl }, encoding: "utf8", maxBuffer: 64 * 1024 * 1024 });
  return JSON.parse(out) as FlagJson[];
}

async function currentFlagId(): Promise<number> {
  return Number(await page.locator('.review-flag[aria-current="true"]').getAttribute("data-flag-id"));
}

/** Waits for the action's notice and for the refreshed queue without the flag. */
async function waitForDone(flagId: number, pattern: RegExp): Promise<void> {
  await page.locator(".review-status__notice").filter({ hasText: pattern }).waitFor({ timeout: 30_000 });
  await page.locator(`.review-flag[data-flag-id="${flagId}"]`).waitFor({ state: "detached", timeout: 30_000 });
  await page.locator('.review-flag[aria-current="true"]').waitFor();
}

beforeAll(async () => {
  app = await startApp({ seed: true });
  page = await app.browser.newPage({ viewport: { width: 1400, height: 1000 } });
  await page.goto(`${app.baseUrl}/review`);
});
afterAll(async () => {
  await app?.stop();
});

describe("review queue, keyboard only", () => {
  test("the queue opens on the worst flag, focused", async () => {
    await page.locator('.review-flag[aria-current="true"]').waitFor();
    const current = await currentFlagId();
    await expect.poll(() => page.evaluate(() => Number(document.activeElement?.getAttribute("data-flag-id")))).toBe(current);
    // worst first: the seeded exact duplicates are errors
    await expect(page.locator('.review-flag[aria-current="true"] .badge').first().innerText()).resolves.toMatch(/Error/);
    await page.keyboard.press("?");
    await expect(page.getByRole("region", { name: "Keyboard shortcuts" }).innerText()).resolves.toMatch(/waive the flag/);
    await page.keyboard.press("?");
  });

  test("three flags worked off: merge, waive, reject", async () => {
    // 1. The exact duplicate: merge it into the earlier record.
    const duplicate = await currentFlagId();
    await page.keyboard.press("m");
    await page.keyboard.type("same coupon keyed twice");
    await page.keyboard.press("Enter");
    await waitForDone(duplicate, new RegExp(`Flag ${duplicate} merged`));

    // 2. Move to the next flag and back (j, k), then waive it with a reason.
    const second = await currentFlagId();
    expect(second).not.toBe(duplicate);
    await page.keyboard.press("j");
    expect(await currentFlagId()).not.toBe(second);
    await page.keyboard.press("k");
    expect(await currentFlagId()).toBe(second);
    await page.keyboard.press("w");
    await page.keyboard.press("Enter"); // no reason yet: refused, nothing changes
    await page.locator(".review-form .field__error").waitFor();
    await expect(page.locator(".review-form .field__error").innerText()).resolves.toMatch(/reason/i);
    // The refused save has finished once its button is back (it is disabled while saving).
    await page.locator('.review-form button[type="submit"]:not([disabled])').waitFor();
    await page.keyboard.type("checked against the source table");
    await page.keyboard.press("Enter");
    await waitForDone(second, new RegExp(`Flag ${second} waived`));

    // 3. Next record (n), then reject it with a reason.
    await page.keyboard.press("n");
    const third = await currentFlagId();
    expect([duplicate, second]).not.toContain(third);
    await page.keyboard.press("r");
    await page.keyboard.type("values misread from a figure");
    await page.keyboard.press("Enter");
    await waitForDone(third, new RegExp(`Flag ${third} rejected`));

    const byId = new Map(flags().map((f) => [f.id, f]));
    expect(byId.get(duplicate)).toMatchObject({ state: "resolved", resolution: "merge", reason: "same coupon keyed twice", resolved_by: "local" });
    expect(byId.get(second)).toMatchObject({ state: "waived", resolution: "waive", reason: "checked against the source table" });
    expect(byId.get(third)).toMatchObject({ state: "resolved", resolution: "reject", reason: "values misread from a figure" });
    // the queue no longer shows them
    for (const id of [duplicate, second, third]) await expect(page.locator(`.review-flag[data-flag-id="${id}"]`).count()).resolves.toBe(0);
  });

  test("Escape closes an open form without acting", async () => {
    const id = await currentFlagId();
    await page.keyboard.press("w");
    await page.locator(".review-form input").first().waitFor();
    await page.keyboard.type("changed my mind");
    await page.keyboard.press("Escape");
    await expect(page.locator(".review-form").count()).resolves.toBe(0);
    expect(flags().find((f) => f.id === id)?.state).toBe("open");
  });
});
