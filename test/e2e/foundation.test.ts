// A new user's first session, in a real browser: create a source, key in a record with mixed
// units, and find it in the records table in canonical units.
import { afterAll, beforeAll, describe, expect, test } from "vitest";
import type { Page } from "playwright-core";
import { startApp, type App } from "./harness";

let app: App;
let page: Page;

beforeAll(async () => {
  app = await startApp({ seed: true });
  page = await app.browser.newPage({ viewport: { width: 1366, height: 900 } });
});
afterAll(async () => {
  await app?.stop();
});

describe("foundation, end to end", () => {
  let sourceId = 0;
  let recordId = 0;

  test("home page shows the seeded collection", async () => {
    await page.goto(app.baseUrl);
    await expect(page.locator("main").innerText()).resolves.toMatch(/3[,.]?000|records/i);
    await expect(page.getByText(/Class 4/).first().isVisible()).resolves.toBe(true);
  });

  test("create a source", async () => {
    await page.goto(`${app.baseUrl}/sources/new`);
    await page.getByLabel("Kind").selectOption("journal_article");
    await page.getByLabel("Title").fill("Browser-entered study of an invented steel");
    await page.getByLabel("Year").fill("2024");
    const form = page.locator("form", { has: page.locator('input[name="title"]') });
    await form.locator('input[name="doi"]').fill("https://doi.org/10.5555/E2E.2024.001");
    await form.locator('button[type="submit"]').click();
    await page.waitForURL(/\/sources\/\d+$/);
    sourceId = Number(new URL(page.url()).pathname.split("/").pop());
    expect(sourceId).toBeGreaterThan(0);
    await expect(page.locator("main").innerText()).resolves.toContain("10.5555/e2e.2024.001");
  });

  test("a bad value is named under its field and nothing is saved", async () => {
    await page.goto(`${app.baseUrl}/records/new?sourceId=${sourceId}`);
    await page.getByLabel("Alloy").fill("SS316L");
    await page.locator('input[name="laserPower.value"]').fill("fast");
    await page.locator('input[name="scanSpeed.value"]').fill("800");
    await page.locator('button[type="submit"]').click();
    await expect(page.locator('[id$="laserPower.value-error"], .field__error').first().innerText()).resolves.toMatch(/laser power/i);
    expect(new URL(page.url()).pathname).toBe("/records/new");
  });

  test("key in a record with mixed units; derived values update live", async () => {
    await page.goto(`${app.baseUrl}/records/new?sourceId=${sourceId}`);
    await page.getByLabel("Page", { exact: true }).fill("3");
    await page.getByLabel("Table, figure or section").fill("Table 1");
    await page.getByLabel("Alloy").fill("SS316L");
    await page.locator('input[name="laserPower.value"]').fill("0.2");
    await page.locator('select[name="laserPower.unit"]').selectOption("kW");
    await page.locator('input[name="scanSpeed.value"]').fill("0,8");
    await page.locator('select[name="scanSpeed.unit"]').selectOption("m/s");
    await page.locator('input[name="hatchSpacing.value"]').fill("0.1");
    await page.locator('select[name="hatchSpacing.unit"]').selectOption("mm");
    await page.locator('input[name="layerThickness.value"]').fill("30");
    await page.locator('select[name="layerThickness.unit"]').selectOption("µm");
    await page.locator('input[name="spotDiameter.value"]').fill("80");
    // E_v = 200 W / (800 mm/s · 0.1 mm · 0.03 mm) = 83.3 J/mm³
    await expect(page.locator(".derived-panel").innerText()).resolves.toMatch(/83\.3/);
    await page.getByLabel("Outcome", { exact: true }).selectOption("dense");
    await page.locator('button[type="submit"]').click();
    await page.waitForURL(/\/records\/\d+$/).catch(async (error) => {
      await page.screenshot({ path: "test-results/foundation-record-form.png", fullPage: true });
      throw error;
    });
    recordId = Number(new URL(page.url()).pathname.split("/").pop());
    expect(recordId).toBeGreaterThan(0);
    const text = await page.locator("main").innerText();
    expect(text).toContain("0,8");
    expect(text).toMatch(/800/);
  });

  test("the record is in the table, normalized", async () => {
    await page.goto(`${app.baseUrl}/records?search=${recordId}`);
    const row = page.locator(`a[href="/records/${recordId}"]`).first();
    await row.waitFor({ timeout: 20_000 });
    const table = await page.getByRole("table", { name: "Build records" }).innerText();
    const line = table.split("\n").join(" ");
    expect(line).toMatch(/316L/);
    expect(line).toMatch(/\b200\b/);
    expect(line).toMatch(/\b800\b/);
    expect(line).toMatch(/\b100\b/);
  });
});
