import { expect, test } from "@playwright/test";
import { screenshotBothWidths, signIn } from "./helpers";

test("the landing page explains the product and links to a contractor's page", async ({ page }) => {
  await page.goto("/");
  await expect(page.getByRole("heading", { level: 1 })).toContainText("cut list");
  await expect(page.getByRole("link", { name: "Try a contractor's page" })).toHaveAttribute("href", "/c/cinder-slate");
  await screenshotBothWidths(page, "landing");
});

test("the sign-in page shows one generic message for a wrong password", async ({ page }) => {
  await signIn(page, "owner@cinder-slate.test", "not-the-password");
  await expect(page.getByRole("alert")).toHaveText("That e-mail and password do not match an account.");
  await signIn(page, "nobody@nowhere.test", "not-the-password");
  await expect(page.getByRole("alert")).toHaveText("That e-mail and password do not match an account.");
  await screenshotBothWidths(page, "sign-in");
});

// Each role lands where its work is: the office in the inbox, the crew at their jobs.
const NAV_BY_ROLE = [
  {
    email: "owner@cinder-slate.test",
    role: "Owner",
    home: /\/app\/inbox$/,
    links: ["Inbox", "Schedule", "Orders", "Reports", "Catalog", "Team", "Company settings"],
  },
  {
    email: "estimator@cinder-slate.test",
    role: "Estimator",
    home: /\/app\/inbox$/,
    links: ["Inbox", "Schedule", "Catalog"],
  },
  { email: "crew@cinder-slate.test", role: "Crew", home: /\/app\/jobs$/, links: ["Jobs", "Catalog"] },
];

for (const person of NAV_BY_ROLE) {
  test(`the ${person.role.toLowerCase()} signs in and sees the ${person.role.toLowerCase()}'s navigation`, async ({
    page,
  }) => {
    await signIn(page, person.email);
    await expect(page).toHaveURL(person.home);
    const nav = page.getByRole("navigation", { name: "Workspace" });
    await expect(nav.getByRole("link")).toHaveText(person.links);
    await expect(page.getByRole("banner").getByText(person.role, { exact: true })).toBeVisible();
  });
}

test("the estimator cannot open company settings", async ({ page }) => {
  await signIn(page, "estimator@cinder-slate.test");
  await expect(page).toHaveURL(/\/app\/inbox$/);
  const response = await page.goto("/app/settings");
  expect(response?.status()).toBe(403);
});

for (const url of ["/app", "/app/catalog", "/app/catalog/1", "/app/settings", "/app/catalog/new"]) {
  test(`an anonymous visitor asking for ${url} is sent to sign-in`, async ({ page }) => {
    await page.goto(url);
    await expect(page).toHaveURL(
      new RegExp(`/login\\?redirectTo=${encodeURIComponent(url).replace(/[.*+?^${}()|[\]\\]/g, "\\$&")}$`),
    );
    await expect(page.getByRole("heading", { name: "Sign in" })).toBeVisible();
  });
}

test("the owner edits a catalog item; a bad value shows its message and nothing is saved", async ({ page }) => {
  await signIn(page, "owner@cinder-slate.test");
  await expect(page).toHaveURL(/\/app\/inbox$/);
  await page.getByRole("navigation", { name: "Workspace" }).getByRole("link", { name: "Catalog" }).click();
  await page.getByRole("link", { name: "Hearthline Taper" }).click();
  await expect(page.getByRole("heading", { name: "Edit Hearthline Taper" })).toBeVisible();

  await page.getByLabel("Back length").fill("14");
  await page.getByRole("button", { name: "Save changes" }).click();
  await expect(page.getByText("Back length must not be longer than the face (12 in)", { exact: false })).toBeVisible();
  await expect(page.getByLabel("Back length")).toHaveAttribute("aria-invalid", "true");

  await page.goto("/app/catalog");
  const row = page.getByRole("row", { name: /Hearthline Taper/ });
  await expect(row).toContainText("face 12 in · back 8 in · depth 8 in · height 4 in");

  await page.getByRole("link", { name: "Hearthline Taper" }).click();
  await page.getByLabel("Cost each").fill("5.10");
  await page.getByRole("button", { name: "Save changes" }).click();
  await expect(page).toHaveURL(/\/app\/catalog\?saved=\d+$/);
  await expect(page.getByRole("status")).toContainText("Saved Hearthline Taper");
  await expect(page.getByRole("row", { name: /Hearthline Taper/ })).toContainText("$5.10");
  await screenshotBothWidths(page, "catalog");
});

test("the north-ridge owner cannot open a cinder-slate catalog item by URL", async ({ page, request }) => {
  const catalog = await (await request.get("/api/catalog/cinder-slate")).json();
  const foreignId = catalog.items[0].id as number;
  await signIn(page, "owner@north-ridge.test");
  await expect(page).toHaveURL(/\/app\/inbox$/);
  const response = await page.goto(`/app/catalog/${foreignId}`);
  expect(response?.status()).toBe(404);
  // The workspace answers inside its own layout: the heading of its not-found message, the navigation kept.
  await expect(page.getByRole("heading", { level: 1 })).toHaveText("We could not find that");
  await expect(page.getByRole("navigation").first()).toBeVisible();
});

test("signing out ends the session on the server, so the old cookie stops working", async ({ page, context }) => {
  await signIn(page, "estimator@cinder-slate.test");
  await expect(page).toHaveURL(/\/app\/inbox$/);
  const [cookie] = (await context.cookies()).filter((c) => c.name === "ew_session");
  await page.getByRole("button", { name: "Sign out" }).click();
  await expect(page.getByText("You are signed out.")).toBeVisible();
  await context.addCookies([cookie!]);
  await page.goto("/app/catalog");
  await expect(page).toHaveURL(/\/login/);
});
