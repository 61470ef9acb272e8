// Paper intake in a real browser: a PDF the test writes itself is uploaded to a source, its page
// fills a record's location, a table is read from a box drawn on the page and imported, and a
// pasted table goes through mapping, preview and an explicit choice to leave out a bad row.
import { afterAll, beforeAll, describe, expect, test } from "vitest";
import type { Page } from "playwright-core";
import { startApp, type App } from "./harness";
import { inventedPaperPdf } from "../support/pdf";

let app: App;
let page: Page;
let sourceId: number;
const outside: string[] = [];
const { pdf, tableBox, doi } = inventedPaperPdf();

async function api<T>(path: string, init?: RequestInit): Promise<T> {
  const res = await fetch(`${app.baseUrl}${path}`, init);
  return (await res.json()) as T;
}

beforeAll(async () => {
  app = await startApp();
  const created = await api<{ id: number }>("/api/sources", {
    method: "POST",
    headers: { "Content-Type": "application/json" },
    body: JSON.stringify({ kind: "journal_article", title: "Process windows of 316L in an invented study", year: 2024, authors: ["Example Test Laboratory"] }),
  });
  sourceId = created.id;
  page = await app.browser.newPage({ viewport: { width: 1500, height: 1100 } });
  // everything, the pdf.js worker included, must come from this server
  page.on("request", (r) => {
    const url = new URL(r.url());
    if (!["127.0.0.1", "localhost"].includes(url.hostname) && url.protocol.startsWith("http")) outside.push(r.url());
  });
}, 600_000);

afterAll(async () => {
  await app?.stop();
});

describe("paper intake", () => {
  test("a PDF uploaded on the source page is stored, and the DOI on its first page is offered and saved", async () => {
    await page.goto(`${app.baseUrl}/sources/${sourceId}`);
    await page.locator("#source-pdf").setInputFiles({ name: "invented-paper.pdf", mimeType: "application/pdf", buffer: pdf });
    await page.getByRole("button", { name: "Upload PDF" }).click();
    await page.getByText("Uploaded and attached.").waitFor();
    await page.getByRole("link", { name: "invented-paper.pdf" }).waitFor();
    await page.getByText(`DOI found in the paper: ${doi}`).waitFor({ timeout: 20_000 });
    await page.getByRole("button", { name: "Use it for this source" }).click();
    await page.getByText(`DOI ${doi} saved.`).waitFor();
    const sources = await api<{ sources: { id: number; doi: string | null }[] }>("/api/sources");
    expect(sources.sources.find((s) => s.id === sourceId)?.doi).toBe(doi);

    // the same bytes again are stored once
    await page.locator("#source-pdf").setInputFiles({ name: "copy.pdf", mimeType: "application/pdf", buffer: pdf });
    await page.getByRole("button", { name: "Upload PDF" }).click();
    await page.getByText("This PDF is already attached to the source.").waitFor();
  });

  test("a file that is not a PDF is refused by its bytes", async () => {
    await page.locator("#source-pdf").setInputFiles({ name: "notes.pdf", mimeType: "application/pdf", buffer: Buffer.from("Alloy,P\n316L,200\n") });
    await page.getByRole("button", { name: "Upload PDF" }).click();
    await page.getByText(/is not a PDF: its content is plain text/).waitFor();
  });

  test("the page in view fills the record's page; the record saves with it", async () => {
    await page.goto(`${app.baseUrl}/records/new?sourceId=${sourceId}`);
    await page.locator(".pdf-pane__canvas").waitFor();
    await page.getByText("of 2").waitFor();
    await page.getByRole("button", { name: "Next page" }).click();
    await expect.poll(() => page.locator('input[name="locationPage"]').inputValue()).toBe("2");
    // the text layer holds the page's words, selectable
    await expect.poll(() => page.locator(".textLayer span", { hasText: "lack of fusion" }).count()).toBeGreaterThan(0);
    // search finds the page
    await page.locator("#pdf-search").fill("Process windows");
    await page.getByRole("button", { name: "Find" }).click();
    await page.locator(".pdf-pane__hits").getByRole("button", { name: "1" }).waitFor();
    await page.getByRole("button", { name: "Next page" }).click();
    await expect.poll(() => page.locator('input[name="locationPage"]').inputValue()).toBe("2");

    await page.locator('input[name="alloy"]').fill("316L");
    await page.locator('input[name="laserPower.value"]').fill("250");
    await page.locator('input[name="scanSpeed.value"]').fill("1200");
    await page.getByRole("button", { name: "Save record" }).click();
    await page.waitForURL(/\/records\/\d+$/);
    const id = Number(new URL(page.url()).pathname.split("/").pop());
    const rows = await api<{ rows: { id: number; locationPage: number | null }[] }>(`/api/records?sourceId=${sourceId}&pageSize=50`);
    expect(rows.rows.find((r) => r.id === id)?.locationPage).toBe(2);
  });

  test("a table boxed on the page is read into rows and imported with the page and box as location", async () => {
    await page.goto(`${app.baseUrl}/records/new?sourceId=${sourceId}`);
    await page.locator(".pdf-pane__canvas").waitFor();
    await page.getByText("of 2").waitFor();
    await page.getByRole("button", { name: "Next page" }).click();
    await page.locator('.pdf-pane__page-layers[data-page="2"]').waitFor();
    await expect.poll(() => page.locator(".textLayer span").count()).toBeGreaterThan(5);
    const zoom = Number((await page.locator(".pdf-pane__zoom").innerText()).replace(/[^\d]/g, "")) / 100;
    await page.getByRole("button", { name: "Read a table" }).click();
    const area = (await page.locator(".pdf-pane__boxer").boundingBox())!;
    const pageHeightPt = 842;
    const toScreen = (xPt: number, yPt: number) => ({ x: area.x + xPt * zoom, y: area.y + (pageHeightPt - yPt) * zoom });
    const a = toScreen(tableBox.x, tableBox.y + tableBox.height);
    const b = toScreen(tableBox.x + tableBox.width, tableBox.y);
    await page.mouse.move(a.x, a.y);
    await page.mouse.down();
    await page.mouse.move(b.x, b.y, { steps: 6 });
    await page.mouse.up();
    const grid = page.locator(".pdf-pane__table table");
    await grid.waitFor();
    expect(await grid.locator("tr").count()).toBe(4);
    expect(await grid.locator("tr").nth(2).locator("td").allInnerTexts()).toEqual(["316L", "250", "1200", "lack of fusion"]);

    await page.getByRole("button", { name: "Map and import these rows" }).click();
    await page.waitForURL(/\/imports\?from=pdf/);
    await page.getByText("3 rows · 0 with errors").waitFor();
    await page.getByRole("button", { name: "Import 3 rows" }).click();
    await page.getByText("Imported 3 records").waitFor({ timeout: 30_000 });
    const rows = await api<{ rows: { locationPage: number | null; locationLabel: string | null; outcome: string }[] }>(`/api/records?sourceId=${sourceId}&pageSize=50`);
    const imported = rows.rows.filter((r) => r.locationLabel?.startsWith("box "));
    expect(imported).toHaveLength(3);
    expect(imported.every((r) => r.locationPage === 2)).toBe(true);
    expect(imported.map((r) => r.outcome).sort()).toEqual(["dense", "keyhole", "lack_of_fusion"]);
  });

  test("a pasted table: units from headers, decimal commas, every row checked; a bad row is left out only when asked", async () => {
    await page.goto(`${app.baseUrl}/imports?sourceId=${sourceId}`);
    await page.getByLabel("Pasted text").check();
    await page.getByLabel("Table text").fill("Alloy\tP (kW)\tv (m/s)\th (mm)\tResult\n316L\t0,2\t0,8\t0,1\tLOF\nIN718\t0,25\t1,2\t0,12\tdesirable\nIN718\t-0,3\t1,2\t0,12\tdense\n");
    await page.getByRole("button", { name: "Read the table" }).click();
    await page.getByText("3 rows · 1 with errors").waitFor();
    await page.getByRole("cell", { name: /laserPower: Laser power must be greater than 0 W/ }).first().waitFor();
    const importButton = page.getByRole("button", { name: /^Import \d+ rows$/ });
    expect(await importButton.isDisabled()).toBe(true);
    await page.getByLabel(/Leave out the 1 row\(s\) with errors/).check();
    await page.getByRole("button", { name: "Import 2 rows" }).click();
    await page.getByText("Imported 2 records").waitFor({ timeout: 30_000 });
    const rows = await api<{ rows: { laserPowerW: number | null; scanSpeedMmPerS: number | null }[] }>(`/api/records?sourceId=${sourceId}&pageSize=100&sort=laserPowerW`);
    expect(rows.rows.some((r) => r.laserPowerW === 200 && r.scanSpeedMmPerS === 800)).toBe(true);
    expect(outside).toEqual([]);
  });
});
