import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { openBrowser, screenshotDir, type BrowserSession } from "./browser";

describe("landing page", () => {
  let s: BrowserSession;
  beforeAll(async () => {
    s = await openBrowser();
  });
  afterAll(async () => {
    await s?.close();
  });

  it("shows the product name, the pitch, sign-in, sign-up and try-out bench links, without console errors", async () => {
    const res = await s.page.goto("/");
    expect(res?.status()).toBe(200);
    await expect(s.page.locator("h1").textContent()).resolves.toContain("Jointproof");
    const signIn = s.page.getByRole("link", { name: /sign in/i }).first();
    await expect(signIn.getAttribute("href")).resolves.toBe("/sign-in");
    await expect(s.page.getByRole("link", { name: "Create an account" }).getAttribute("href")).resolves.toBe(
      "/sign-up",
    );
    await expect(s.page.getByRole("link", { name: "Open the try-out bench" }).getAttribute("href")).resolves.toBe(
      "/bench",
    );
    await s.page.screenshot({ path: `${screenshotDir}/landing.png`, fullPage: true });
    expect(s.errors).toEqual([]);
  });

  it("links the safety caution from the footer", async () => {
    await s.page.goto("/");
    await s.page
      .getByRole("link", { name: /safety/i })
      .last()
      .click();
    await s.page.waitForURL("**/safety");
    await expect(s.page.locator("h1").textContent()).resolves.toMatch(/safety/i);
  });
});
