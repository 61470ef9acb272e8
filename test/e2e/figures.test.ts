// Records from a figure in a real browser: a power–speed plot (linear power, log speed, red squares
// for keyhole and blue circles for dense builds) rendered to a PNG is uploaded, its axes calibrated
// by clicking two ticks each, its markers found from one clicked marker per colour, one point
// removed, the records previewed (nothing written) and then written with their provenance.
import { writeFileSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, test } from "vitest";
import type { Page } from "playwright-core";
import { startApp, type App } from "./harness";
import { inventedFigurePdf } from "../support/pdf";
import { renderPdfPage, type RenderedPage } from "../support/pdf-render";

let app: App;
let page: Page;
let sourceId: number;
let rendered: RenderedPage;
const figure = inventedFigurePdf();

async function api<T>(p: string, init?: RequestInit): Promise<T> {
  const res = await fetch(`${app.baseUrl}${p}`, init);
  return (await res.json()) as T;
}

beforeAll(async () => {
  rendered = await renderPdfPage(figure.pdf, figure.page, 1.5);
  app = await startApp();
  const created = await api<{ id: number }>("/api/sources", {
    method: "POST",
    headers: { "Content-Type": "application/json" },
    body: JSON.stringify({ kind: "journal_article", title: "Process map of 316L in an invented study", year: 2024, authors: ["Example Test Laboratory"] }),
  });
  sourceId = created.id;
  page = await app.browser.newPage({ viewport: { width: 1400, height: 1800 } });
}, 600_000);

afterAll(async () => {
  await app?.stop();
});

/** Clicks the figure at a pixel of the rendered image. */
async function clickPixel(px: { x: number; y: number }) {
  const box = (await page.getByTestId("figure-overlay").boundingBox())!;
  await page.mouse.click(box.x + (px.x * box.width) / rendered.width, box.y + (px.y * box.height) / rendered.height);
}

const markerPt = (p: { laserPowerW: number; scanSpeedMmPerS: number }) =>
  rendered.toPixel(figure.frame.left + ((p.laserPowerW - 100) / 300) * (figure.frame.right - figure.frame.left), figure.frame.bottom + ((Math.log10(p.scanSpeedMmPerS) - 2) / 2) * (figure.frame.top - figure.frame.bottom));

describe("records from a figure", () => {
  test("an uploaded plot is calibrated, its markers found and checked, previewed, then written", async () => {
    await page.goto(`${app.baseUrl}/figures?sourceId=${sourceId}`);
    await page.locator("#figure-image").setInputFiles({ name: "figure-3.png", mimeType: "image/png", buffer: rendered.png });
    await page.getByTestId("figure-overlay").waitFor();

    await page.getByLabel("Figure label").fill("Fig. 3");
    await page.getByLabel("Alloy").fill("316L");
    await page.getByLabel("Fixed hatch spacing", { exact: true }).fill("100");
    await page.getByLabel("Fixed layer thickness", { exact: true }).fill("30");

    // x: laser power, linear; y: scan speed, log
    await page.getByRole("button", { name: /Mark x ticks/ }).click();
    for (const t of figure.ticks.x) await clickPixel(rendered.toPixel(t.xPt, figure.frame.bottom));
    await page.getByLabel("x tick 1 value").fill(String(figure.ticks.x[0]!.value));
    await page.getByLabel("x tick 2 value").fill(String(figure.ticks.x[1]!.value));
    await page.getByLabel("y axis scale").selectOption("log");
    await page.getByRole("button", { name: /Mark y ticks/ }).click();
    for (const t of figure.ticks.y) await clickPixel(rendered.toPixel(figure.frame.left, t.yPt));
    // equal values are refused with a message before anything is sent
    await page.getByLabel("y tick 1 value").fill("10000");
    await page.getByLabel("y tick 2 value").fill("10000");
    await page.getByText(/vertical \(y\) axis: the two marked ticks have the same value/).waitFor();
    await page.getByLabel("y tick 1 value").fill(String(figure.ticks.y[0]!.value));

    await page.getByLabel("Kind 1 outcome").selectOption("keyhole");
    await page.getByLabel("Kind 1 legend").fill("red squares");
    await page.getByRole("button", { name: "Add a marker kind" }).click();
    await page.getByLabel("Kind 2 outcome").selectOption("dense");
    await page.getByLabel("Kind 2 legend").fill("blue circles");

    const keyhole = figure.points.filter((p) => p.outcome === "keyhole");
    const dense = figure.points.filter((p) => p.outcome === "dense");
    await page.getByRole("button", { name: "Find markers like a clicked one" }).click();
    await page.getByLabel("Place kind 1").check();
    await clickPixel(markerPt(keyhole[0]!));
    await page.getByText(`Found ${keyhole.length} markers like the one clicked (${keyhole.length} new)`).waitFor();
    await page.getByLabel("Place kind 2").check();
    await clickPixel(markerPt(dense[0]!));
    await page.getByText(`Found ${dense.length} markers like the one clicked (${dense.length} new)`).waitFor();
    await page.getByText(`${figure.points.length} points`, { exact: true }).waitFor();

    // a point clicked off the marked axes is listed as outside; removing it leaves the rest
    await page.getByRole("button", { name: "Add points" }).click();
    await clickPixel({ x: 5, y: 5 });
    await page.getByRole("cell", { name: "outside the marked axes" }).waitFor();
    await page.getByRole("button", { name: `Remove point ${figure.points.length + 1}` }).click();
    await expect.poll(() => page.getByRole("cell", { name: "outside the marked axes" }).count()).toBe(0);

    const before = await api<{ total: number }>(`/api/records?sourceId=${sourceId}&pageSize=1`);
    await page.getByRole("button", { name: "Preview records" }).click();
    await page.getByText(`${figure.points.length} records would be written`).waitFor();
    expect((await api<{ total: number }>(`/api/records?sourceId=${sourceId}&pageSize=1`)).total).toBe(before.total);
    await page.screenshot({ path: path.join(os.tmpdir(), "meltledger-figures.png"), fullPage: true });

    await page.getByRole("button", { name: "Write records" }).click();
    await page.getByText(`Wrote ${figure.points.length} records from Fig. 3.`).waitFor({ timeout: 30_000 });
    const rows = await api<{ rows: { laserPowerW: number; scanSpeedMmPerS: number; outcome: string; locationLabel: string | null; hatchSpacingUm: number | null }[] }>(`/api/records?sourceId=${sourceId}&pageSize=100`);
    const read = rows.rows.filter((r) => r.locationLabel?.startsWith("Fig. 3 · px"));
    expect(read).toHaveLength(figure.points.length);
    for (const truth of figure.points) {
      const near = read.find((r) => Math.abs(r.laserPowerW - truth.laserPowerW) <= 3 && Math.abs(Math.log10(r.scanSpeedMmPerS / truth.scanSpeedMmPerS)) <= 0.02);
      expect(near?.outcome).toBe(truth.outcome);
      expect(near?.hatchSpacingUm).toBe(100);
    }
    writeFileSync(path.join(os.tmpdir(), "meltledger-figures.json"), JSON.stringify(read.slice(0, 3)));
  });

  test("from the PDF pane: the paper's page opens in the reader, markers are found and a point dragged", async () => {
    const form = new FormData();
    form.append("file", new Blob([new Uint8Array(figure.pdf)], { type: "application/pdf" }), "figure-paper.pdf");
    const res = await fetch(`${app.baseUrl}/api/sources/${sourceId}/documents`, { method: "POST", body: form });
    expect(res.status).toBe(201);
    await page.goto(`${app.baseUrl}/records/new?sourceId=${sourceId}`);
    await page.locator(".pdf-pane__canvas").waitFor();
    await page.getByText("of 2").waitFor();
    await page.getByRole("button", { name: "Next page" }).click();
    await page.locator('.pdf-pane__page-layers[data-page="2"]').waitFor();
    await page.getByRole("link", { name: "Read a figure" }).click();
    await page.waitForURL(/\/figures\?sourceId=\d+&document=\d+&page=2/);
    await page.getByTestId("figure-overlay").waitFor({ timeout: 20_000 });
    // the reader renders the page at twice its point size
    const size = await page.locator(".figure-reader__canvas").evaluate((c: HTMLCanvasElement) => ({ width: c.width, height: c.height }));
    expect(size).toEqual({ width: 595 * 2, height: 842 * 2 });
    const box = (await page.getByTestId("figure-overlay").boundingBox())!;
    const toScreen = (xPt: number, yPt: number) => ({ x: box.x + (xPt * 2 * box.width) / size.width, y: box.y + ((figure.pageHeightPt - yPt) * 2 * box.height) / size.height });
    const dense = figure.points.filter((p) => p.outcome === "dense");
    const seed = dense[0]!;
    const seedPt = { x: figure.frame.left + ((seed.laserPowerW - 100) / 300) * (figure.frame.right - figure.frame.left), y: figure.frame.bottom + ((Math.log10(seed.scanSpeedMmPerS) - 2) / 2) * (figure.frame.top - figure.frame.bottom) };
    await page.getByRole("button", { name: "Find markers like a clicked one" }).click();
    const at = toScreen(seedPt.x, seedPt.y);
    await page.mouse.click(at.x, at.y);
    await page.getByText(`Found ${dense.length} markers like the one clicked (${dense.length} new)`).waitFor();
    // drag the first point 20 px to the right (in image pixels)
    const first = page.locator('circle[data-point="1"]');
    const before = await page.getByRole("row").nth(1).getByRole("cell").nth(2).innerText();
    const c = (await first.boundingBox())!;
    await page.mouse.move(c.x + c.width / 2, c.y + c.height / 2);
    await page.mouse.down();
    await page.mouse.move(c.x + c.width / 2 + (20 * box.width) / size.width, c.y + c.height / 2, { steps: 5 });
    await page.mouse.up();
    const [bx, by] = before.split(",").map((v) => Number(v.trim()));
    const moved = async () => {
      const [ax, ay] = (await page.getByRole("row").nth(1).getByRole("cell").nth(2).innerText()).split(",").map((v) => Number(v.trim()));
      return Math.abs(ax! - bx! - 20) <= 1 && Math.abs(ay! - by!) <= 1;
    };
    await expect.poll(moved).toBe(true);
  });
});
