/*
 * A crew member's day on site, on a phone (390 × 844): the job booked for them, its checklist ticked
 * with no signal and sent when the signal returns, hours, a progress photo, and "built" with the
 * finished photos. Uses Leontyne Marsh's job (build booked, the demo crew member on the build, the
 * job given to nobody), which no other spec changes.
 */
import AxeBuilder from "@axe-core/playwright";
import { expect, test } from "@playwright/test";
import { screenshotThreeWidths, signIn } from "./helpers";

test.use({ viewport: { width: 390, height: 844 } });

// A 2 × 2 PNG (the same bytes the configurator spec sends).
const PNG = Buffer.from(
  "89504e470d0a1a0a0000000d494844520000000200000002080600000072b60d240000000970485973000003e8000003e801b57b526b0000001149444154089963385161f31f8419600c00588c09edd7703b820000000049454e44ae426082",
  "hex",
);

test("a crew member ticks two steps with no signal, sees them kept and then saved, logs hours, adds a photo and marks the job built", async ({
  page,
  context,
}) => {
  test.setTimeout(120_000);
  await signIn(page, "crew@cinder-slate.test");
  await expect(page).toHaveURL(/\/app\/jobs$/);
  // The booked build comes first, under "Coming up", with its days.
  const coming = page.getByRole("region", { name: "Coming up" });
  const card = coming.getByRole("listitem").filter({ hasText: "Leontyne Marsh" });
  await expect(card).toContainText("Build days:");
  await screenshotThreeWidths(page, "crew-day-jobs");
  await card.getByRole("link", { name: "On site" }).click();

  await expect(page.getByRole("heading", { level: 1 })).toHaveText("Leontyne Marsh");
  await expect(page.getByRole("link", { name: "Directions" })).toHaveAttribute("href", /^geo:0,0\?q=15%20Tallowmere/);
  await expect(page.getByRole("region", { name: "Safety on site" })).toContainText("Call 811");
  const dig = page.getByRole("checkbox", { name: /Dig and lay the base/ });
  const first = page.getByRole("checkbox", { name: /Set the first course level/ });
  await expect(dig).toBeEnabled();

  // No signal: the ticks are kept on the phone.
  await context.setOffline(true);
  await dig.check();
  await first.check();
  await expect(page.getByTestId("state-dig-base")).toHaveText("Saved on this phone, will send");
  await expect(page.getByTestId("state-course-1")).toHaveText("Saved on this phone, will send");
  await expect(page.getByRole("region", { name: "Checklist" })).toContainText(
    "2 changes are saved on this phone and will be sent when there is signal.",
  );
  // Signal again: the page sends them on its own.
  await context.setOffline(false);
  await expect(page.getByTestId("state-dig-base")).toHaveText(/^Saved · ticked by Dario Quist$/, {
    timeout: 30_000,
  });
  await expect(page.getByTestId("state-course-1")).toHaveText(/^Saved/);
  await expect(page.getByRole("region", { name: "Checklist" })).toContainText("2 of");
  await page.reload();
  await expect(dig).toBeChecked();
  await expect(first).toBeChecked();
  await expect(page.getByTestId("state-dig-base")).toHaveText(/^Saved/);

  // Hours: a value off the quarter hour is refused beside the field, then 7.5 h is saved.
  const hours = page.getByRole("region", { name: "Hours" });
  await expect(hours.getByLabel("Who worked")).toHaveValue(/\d+/);
  await hours.getByLabel("Hours", { exact: true }).fill("7.3");
  await hours.getByRole("button", { name: "Save the hours" }).click();
  await expect(hours.getByText(/Hours must be between 0.25 and 16, in quarter hours/)).toBeVisible();
  await hours.getByLabel("Hours", { exact: true }).fill("7.5");
  await hours.getByRole("button", { name: "Save the hours" }).click();
  await expect(page.getByRole("status").filter({ hasText: "Hours saved." })).toBeVisible();
  await expect(page.getByRole("region", { name: "Hours" })).toContainText("Dario Quist: 7.5 h");

  // A progress photo.
  const photos = page.getByRole("region", { name: "Build photos" });
  await photos
    .getByLabel("Add progress photos")
    .setInputFiles({ name: "course-2.png", mimeType: "image/png", buffer: PNG });
  await photos.getByRole("button", { name: "Save the photos" }).click();
  await expect(page.getByRole("status").filter({ hasText: "Photos saved." })).toBeVisible();
  await expect(page.getByRole("img", { name: "During the build: course-2.png" })).toBeVisible();

  await screenshotThreeWidths(page, "crew-day-job");
  const axe = await new AxeBuilder({ page }).analyze();
  expect(axe.violations.map((v) => `${v.id}: ${v.nodes.map((n) => n.target.join(" ")).join(", ")}`)).toEqual([]);

  // Built: not without a photo of the finished pit; with one, the job is built.
  const built = page.getByRole("region", { name: "Built", exact: true });
  await built.getByRole("button", { name: "Mark the job built" }).click();
  await expect(built.getByText("Add at least one photo of the finished pit to mark the job built.")).toBeVisible();
  await built
    .getByLabel("Photos of the finished pit")
    .setInputFiles({ name: "finished.png", mimeType: "image/png", buffer: PNG });
  await built.getByRole("button", { name: "Mark the job built" }).click();
  await expect(page.getByRole("status").filter({ hasText: "Marked built." })).toBeVisible();
  await expect(built).toContainText("This job is marked built.");
  await expect(page.getByRole("img", { name: "The finished job: finished.png" })).toBeVisible();
  // The stage under the name says so too.
  await expect(page.getByRole("paragraph").filter({ hasText: /^Built$/ })).toBeVisible();
});

test("the owner sees every signed job with its build days, and the crew's records on the job page", async ({
  page,
}) => {
  await signIn(page, "owner@cinder-slate.test");
  await page.goto("/app/jobs");
  const perpetua = page.getByRole("listitem").filter({ hasText: "Perpetua Vance" });
  await expect(perpetua).toContainText("Build days:");
  await expect(perpetua).toContainText("Crew:");
  await perpetua.getByRole("link", { name: "On site" }).click();
  // The seed ticked every step of the built job and recorded the crew's hours.
  await expect(page.getByRole("region", { name: "Checklist" })).toContainText(/(\d+) of \1 done\./);
  await expect(page.getByRole("region", { name: "Hours" })).toContainText(/Dario Quist: \d+(\.\d+)? h/);
  await screenshotThreeWidths(page, "crew-day-owner-job");
  const axe = await new AxeBuilder({ page }).analyze();
  expect(axe.violations.map((v) => v.id)).toEqual([]);
});
