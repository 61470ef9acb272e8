// The coverage page in a real browser on the demo scenario: change a filter, download a chart as
// SVG (and check it opens as SVG) and as PNG, see an empty selection explained, and suggest
// experiments: an impossible limit refused, then a set with its CSV, the caution at its head.
import { readFileSync } from "node:fs";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, test } from "vitest";
import type { Page } from "playwright-core";
import { startApp, type App } from "./harness";

let app: App;
let page: Page;

beforeAll(async () => {
  app = await startApp({ seed: true });
  page = await app.browser.newPage({ viewport: { width: 1366, height: 900 }, acceptDownloads: true });
});
afterAll(async () => {
  await app?.stop();
});

async function screenshotOnFailure<T>(name: string, body: () => Promise<T>): Promise<T> {
  try {
    return await body();
  } catch (error) {
    await page.screenshot({ path: `test-results/coverage-${name}.png`, fullPage: true }).catch(() => undefined);
    throw error;
  }
}

describe("coverage page, end to end", () => {
  test("opens from the navigation and draws the charts", async () => {
    await page.goto(app.baseUrl);
    await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Coverage" }).click();
    await page.waitForURL(/\/coverage$/);
    await page.locator('[data-chart^="coverage-scatter"] > svg').waitFor();
    await expect(page.locator("main").innerText()).resolves.toMatch(/choose one alloy/i);
  });

  test("changing a filter updates the view and the address bar", async () => {
    await screenshotOnFailure("filter", async () => {
      await page.getByRole("combobox", { name: "Alloy", exact: true }).selectOption("316L");
      await page.getByRole("textbox", { name: "Layer thickness", exact: true }).fill("40um");
      await page.getByRole("button", { name: "Show coverage" }).click();
      await page.waitForURL(/alloy=316L/);
      expect(page.url()).toMatch(/layer=40um/);
      await page.getByText(/Window for 316L/).first().waitFor();
      const summary = await page.getByLabel("Coverage summary").innerText();
      expect(summary).toMatch(/window cells hold ≥ 3 records/);
      expect(summary).toMatch(/t 40 µm \(middle of the filter\)/);
    });
  });

  test("a chart downloads as an SVG that opens as SVG, and as a PNG", async () => {
    await screenshotOnFailure("download", async () => {
      const [svgDownload] = await Promise.all([page.waitForEvent("download"), page.getByRole("button", { name: "Download “Records per cell” as SVG" }).click()]);
      expect(svgDownload.suggestedFilename()).toBe("coverage-grid-316l.svg");
      const text = readFileSync((await svgDownload.path())!, "utf8");
      const parsed = await page.evaluate((svg) => {
        const doc = new DOMParser().parseFromString(svg, "image/svg+xml");
        const root = doc.documentElement;
        return { name: root.nodeName, ns: root.namespaceURI, errors: doc.getElementsByTagName("parsererror").length, title: root.querySelector("title")?.textContent, rects: root.querySelectorAll("rect").length };
      }, text);
      expect(parsed).toMatchObject({ name: "svg", ns: "http://www.w3.org/2000/svg", errors: 0, title: "Records per cell" });
      expect(parsed.rects).toBeGreaterThan(20);
      // It also opens on its own, as a file, in the browser.
      const saved = path.join(app.dir, svgDownload.suggestedFilename());
      await svgDownload.saveAs(saved);
      const viewer = await app.browser.newPage();
      await viewer.goto(`file://${saved}`);
      await expect(viewer.evaluate(() => document.documentElement.namespaceURI)).resolves.toBe("http://www.w3.org/2000/svg");
      await viewer.close();

      const [pngDownload] = await Promise.all([page.waitForEvent("download"), page.getByRole("button", { name: "Download “Power–speed plane by outcome” as PNG" }).click()]);
      const png = readFileSync((await pngDownload.path())!);
      expect([...png.subarray(0, 8)]).toEqual([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]);
    });
  });

  test("an empty selection is explained instead of drawn", async () => {
    await page.getByRole("textbox", { name: "Hatch spacing", exact: true }).fill("900um");
    await page.getByRole("button", { name: "Show coverage" }).click();
    await page.getByText("Nothing to chart for this selection").waitFor();
    await expect(page.locator("main").innerText()).resolves.toMatch(/No records match \(alloy 316L.*hatch 900um/);
    await expect(page.locator("[data-chart]").count()).resolves.toBe(0);
    await page.getByRole("textbox", { name: "Hatch spacing", exact: true }).fill("");
    await page.getByRole("button", { name: "Show coverage" }).click();
    await page.locator('[data-chart^="coverage-grid"] > svg').waitFor();
  });

  test("suggestions: the caution is shown, impossible limits are refused, a set downloads as CSV", async () => {
    await screenshotOnFailure("suggest", async () => {
      const panel = page.getByRole("region", { name: /Suggested experiments for 316L/ });
      await expect(panel.innerText()).resolves.toMatch(/Class 4 lasers \(IEC 60825-1\)[\s\S]*NFPA 484[\s\S]*not safety-checked/);
      await panel.getByRole("textbox", { name: "Power range", exact: true }).fill("400-50W");
      await panel.getByRole("button", { name: "Suggest experiments" }).click();
      await panel.getByText(/is above the maximum \(50\): swap them/).first().waitFor();

      await panel.getByRole("textbox", { name: "Power range", exact: true }).fill("100-380W");
      await panel.getByRole("textbox", { name: "Speed range", exact: true }).fill("400-2000mm/s");
      await panel.getByRole("textbox", { name: "Hatch values", exact: true }).fill("95um");
      await panel.getByRole("textbox", { name: "Layer values", exact: true }).fill("40um");
      await panel.getByRole("textbox", { name: "How many", exact: true }).fill("8");
      await panel.getByRole("button", { name: "Suggest experiments" }).click();
      const table = panel.getByRole("table", { name: "Suggested experiments" });
      await table.waitFor();
      await expect(table.locator("tbody").count()).resolves.toBe(8);
      // The suggestions appear on the scatter plot too.
      await expect(page.locator('[data-chart^="coverage-scatter"]').textContent()).resolves.toMatch(/suggested experiment/);

      const [csv] = await Promise.all([page.waitForEvent("download"), panel.getByRole("link", { name: "Download CSV for the shop floor" }).click()]);
      const lines = readFileSync((await csv.path())!, "utf8").split("\r\n");
      expect(lines[0]).toBe("# Safety: LPBF machines use Class 4 lasers (IEC 60825-1).");
      expect(lines.filter((l) => /^\d+,316L,/.test(l))).toHaveLength(8);
    });
  });
});
