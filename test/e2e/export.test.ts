// Building a training set on the export page in a real browser: preview the counts, run it,
// download a file, and run the saved export again.
import { readFileSync } from "node:fs";
import { afterAll, beforeAll, describe, expect, test } from "vitest";
import type { Page } from "playwright-core";
import { closeSqlite } from "@/lib/db/connection";
import { acceptRecordsForTest } from "../support/accept-records";
import { startApp, type App } from "./harness";

let app: App;
let page: Page;

beforeAll(async () => {
  app = await startApp({ seed: true });
  // The demo's records await review; the test stands in for the reviewer (test helper, temp database).
  process.env.DATABASE_URL = app.databaseUrl;
  expect(acceptRecordsForTest()).toBeGreaterThan(1000);
  closeSqlite();
  page = await app.browser.newPage({ viewport: { width: 1366, height: 900 }, acceptDownloads: true });
});
afterAll(async () => {
  await app?.stop();
});

describe("training-set export, end to end", () => {
  test("preview, run, download", async () => {
    await page.goto(`${app.baseUrl}/export`);
    await page.waitForLoadState("networkidle");
    await page.getByLabel("Balancing", { exact: true }).selectOption("smote");
    await page.getByLabel("Neighbours k", { exact: true }).waitFor();
    await page.getByLabel("Seed", { exact: true }).fill("5");
    await page.getByRole("button", { name: "Preview counts" }).click();
    await page.getByRole("heading", { name: "Preview" }).waitFor();
    await expect(page.locator("main").innerText()).resolves.toMatch(/labelled record\(s\) from \d+ source\(s\)/);

    await page.getByRole("button", { name: "Run export" }).click();
    await page.getByRole("heading", { name: /Export “.+” saved/ }).waitFor({ timeout: 120_000 }).catch(async (error) => {
      await page.screenshot({ path: "test-results/export-run.png", fullPage: true });
      throw error;
    });
    const files = page.getByRole("list", { name: /Files of / });
    await expect(files.getByRole("link").allInnerTexts()).resolves.toEqual(["train.csv", "validation.csv", "test.csv", "train.parquet", "validation.parquet", "test.parquet", "DATASHEET.md", "manifest.json"]);
    const [download] = await Promise.all([page.waitForEvent("download"), files.getByRole("link", { name: "train.csv" }).click()]);
    const csv = readFileSync((await download.path())!, "utf8");
    const header = csv.split("\n")[0]!.split(",");
    for (const c of ["record_id", "source_id", "split", "is_synthetic", "label", "meltpool_width_um"]) expect(header).toContain(c);
    const manifestLink = await files.getByRole("link", { name: "manifest.json" }).getAttribute("href");
    const manifest = (await (await page.request.get(`${app.baseUrl}${manifestLink}`)).json()) as { options: unknown; counts: unknown; warnings: string[] };
    const synthetic = csv.split("\n").filter((line) => line.split(",")[4] === "1");
    expect(synthetic.length, JSON.stringify([manifest.options, manifest.counts, manifest.warnings])).toBeGreaterThan(0);
    expect(synthetic[0]!.startsWith(",,")).toBe(true); // no record id, no source
    await page.screenshot({ path: "test-results/export-page.png", fullPage: true });
  });

  test("a saved export runs again with identical files", async () => {
    await page.goto(`${app.baseUrl}/export`);
    const button = page.getByRole("button", { name: /^Run .+ again$/ }).first();
    await button.click();
    await page.waitForURL(/\/export\?run=/);
    await expect(page.getByText(/Every file is byte-identical to/).isVisible()).resolves.toBe(true);
  });

  test("a filter that leaves nothing gets a clear message", async () => {
    await page.goto(`${app.baseUrl}/export`);
    await page.waitForLoadState("networkidle");
    await page.getByLabel("Entered to", { exact: true }).fill("2000-01-01");
    await page.getByLabel("Seed", { exact: true }).fill("5");
    await page.getByRole("button", { name: "Run export" }).click();
    await page.getByRole("alert").filter({ hasText: "Nothing was written" }).waitFor();
    await expect(page.getByRole("alert").filter({ hasText: "Nothing was written" }).innerText()).resolves.toMatch(/No record is left to export/);
  });
});
