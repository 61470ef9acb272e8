// Team mode in a real browser: the login page, a wrong password, a contributor's session, the admin
// page refused to them, logging out; and the security headers on what the server sends.
import { execFileSync } from "node:child_process";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, test } from "vitest";
import type { Page } from "playwright-core";
import { startApp, type App } from "./harness";

let app: App;
let page: Page;
const BIN = path.resolve(import.meta.dirname, "../../bin/meltledger.mjs");

beforeAll(async () => {
  process.env.MELTLEDGER_MODE = "team";
  try {
    app = await startApp();
  } finally {
    delete process.env.MELTLEDGER_MODE;
  }
  const env = { ...process.env, DATABASE_URL: app.databaseUrl };
  execFileSync(process.execPath, [BIN, "users", "add", "Corvin Test", "--role", "contributor", "--password-stdin"], { env, input: "contributor-passphrase\n", stdio: ["pipe", "pipe", "pipe"] });
  page = await app.browser.newPage({ viewport: { width: 1280, height: 800 } });
});
afterAll(async () => {
  await app?.stop();
});

describe("accounts, end to end (team mode)", () => {
  test("a visitor without a session is sent to the login page; the API answers 401", async () => {
    await page.goto(`${app.baseUrl}/records`);
    expect(new URL(page.url()).pathname).toBe("/login");
    const api = await fetch(`${app.baseUrl}/api/records`);
    expect(api.status).toBe(401);
    expect(((await api.json()) as { error: { code: string } }).error.code).toBe("unauthenticated");
  });

  test("every response carries the security headers", async () => {
    for (const p of ["/login", "/api/records", "/api/pdf-worker"]) {
      const res = await fetch(`${app.baseUrl}${p}`);
      expect(res.headers.get("content-security-policy")).toMatch(/frame-ancestors 'none'/);
      expect(res.headers.get("x-content-type-options")).toBe("nosniff");
      expect(res.headers.get("x-frame-options")).toBe("DENY");
      expect(res.headers.get("referrer-policy")).toBe("same-origin");
    }
  });

  test("a wrong password is refused; the right one opens the page asked for, with an HttpOnly SameSite=Lax cookie", async () => {
    await page.getByLabel("User name").fill("Corvin Test");
    await page.getByLabel("Password").fill("not-the-passphrase");
    await page.getByRole("button", { name: "Log in" }).click();
    await page.getByText("Wrong user name or password").first().waitFor();
    await page.getByLabel("Password").fill("contributor-passphrase");
    await page.getByRole("button", { name: "Log in" }).click();
    await page.waitForURL(/\/records$/);
    await expect(page.locator(".account-menu").innerText()).resolves.toMatch(/Corvin Test\s*\(contributor\)/);
    const cookie = (await page.context().cookies()).find((c) => c.name === "meltledger_session");
    expect(cookie).toMatchObject({ httpOnly: true, sameSite: "Lax" });
  });

  test("a contributor is refused the admin page", async () => {
    const res = await page.goto(`${app.baseUrl}/admin/users`);
    expect(res?.status()).toBe(403);
    await expect(page.locator("body").innerText()).resolves.toMatch(/Only admins/);
  });

  test("logging out ends the session", async () => {
    await page.goto(`${app.baseUrl}/records`);
    await page.getByRole("button", { name: "Log out" }).click();
    await page.waitForURL(/\/login$/);
    await page.goto(`${app.baseUrl}/records`);
    expect(new URL(page.url()).pathname).toBe("/login");
  });
});
