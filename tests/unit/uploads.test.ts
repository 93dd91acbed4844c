import { readdir } from "node:fs/promises";
import path from "node:path";
import { expect, test } from "vitest";
import { TINY_JPEG, TINY_PNG } from "./support/images";
import { checkPhotos, cleanOriginalName, MAX_PHOTO_BYTES, storePhotos, deleteStoredPhotos } from "~/lib/uploads.server";

const file = (bytes: Uint8Array<ArrayBuffer>, name: string, type = "image/jpeg") => new File([bytes], name, { type });

test("a real PNG and JPEG pass, typed by their bytes", async () => {
  const result = await checkPhotos([file(TINY_PNG, "yard.png", "image/png"), file(TINY_JPEG, "side.jpg")]);
  expect(result.ok && result.photos.map((p) => p.mimeType)).toEqual(["image/png", "image/jpeg"]);
});

test("a text file renamed .jpg is refused (OWASP File Upload Cheat Sheet: check content, not the name)", async () => {
  const result = await checkPhotos([file(new TextEncoder().encode("just some text, honestly"), "yard.jpg")]);
  expect(result).toEqual({ ok: false, message: '"yard.jpg" is not a JPEG, PNG or WebP photo.' });
});

test("an HTML file claiming to be an image is refused", async () => {
  const result = await checkPhotos([file(new TextEncoder().encode("<svg onload=alert(1)>"), "x.png", "image/png")]);
  expect(result.ok).toBe(false);
});

test("seven photos are refused: six is the limit", async () => {
  const result = await checkPhotos(Array.from({ length: 7 }, (_, i) => file(TINY_PNG, `p${i}.png`, "image/png")));
  expect(result).toEqual({ ok: false, message: "Attach at most 6 photos (you chose 7)." });
});

test("a photo over 10 MB is refused before its bytes are inspected", async () => {
  const big = new Uint8Array(MAX_PHOTO_BYTES + 1);
  big.set(TINY_PNG);
  const result = await checkPhotos([file(big, "huge.png", "image/png")]);
  expect(result).toEqual({ ok: false, message: '"huge.png" is larger than 10 MB. Send a smaller photo.' });
});

test("names with ../ are harmless: the label loses its folders and the file gets a generated name", async () => {
  expect(cleanOriginalName("../../etc/passwd.png")).toBe("passwd.png");
  expect(cleanOriginalName("..\\..\\win.ini")).toBe("win.ini");
  expect(cleanOriginalName("...")).toBe("photo");
  const result = await checkPhotos([file(TINY_PNG, "../../../escape.png", "image/png")]);
  if (!result.ok) throw new Error(result.message);
  const [stored] = await storePhotos(result.photos);
  expect(stored).toMatch(/^[0-9a-f-]{36}\.png$/);
  expect(await readdir(path.resolve(process.env.UPLOADS_DIR!))).toContain(stored);
  await deleteStoredPhotos([stored!]);
});

test("a polyglot (a real PNG header with a script inside) is refused (OWASP File Upload Cheat Sheet)", async () => {
  const polyglot = new Uint8Array([...TINY_PNG, ...new TextEncoder().encode("<script>alert(1)</script>")]);
  const result = await checkPhotos([file(polyglot, "trick.png", "image/png")]);
  expect(result).toEqual({ ok: false, message: '"trick.png" contains web page code as well as a picture. Send a plain photo.' });
});

test("photo files that no lead names are swept; recorded ones stay", async () => {
  const { sweepUnrecordedPhotos } = await import("~/lib/leads.server");
  const checked = await checkPhotos([file(TINY_PNG, "a.png", "image/png"), file(TINY_PNG, "b.png", "image/png")]);
  if (!checked.ok) throw new Error(checked.message);
  const [orphan, other] = await storePhotos(checked.photos);
  // Age 0: everything unrecorded counts as left behind.
  expect(await sweepUnrecordedPhotos(-1)).toBeGreaterThanOrEqual(2);
  const left = await readdir(path.resolve(process.env.UPLOADS_DIR!));
  expect(left).not.toContain(orphan);
  expect(left).not.toContain(other);

  const { createLead } = await import("~/lib/leads.server");
  const { demoCompany } = await import("./support/demo");
  const { company } = await demoCompany();
  const { leadPhotos } = await import("~/db/schema");
  const { db } = await import("~/lib/db.server");
  await createLead({
    company,
    form: { customerName: "Pia Lindqvist", email: "pia@example.test", phone: "555 010 3344", street: "9 Fern St", town: "Millbrook Falls", buildWindow: "next-year", notes: "", consent: "on" },
    photos: checked.photos.slice(0, 1),
    origin: "http://localhost",
    snapshot: { design: {}, plan: {}, stoneName: "Test", bowlDiameterIn: 36, priceLowCents: null, priceHighCents: null, summary: [] },
  });
  const [recorded] = await db.select().from(leadPhotos);
  expect(await sweepUnrecordedPhotos(-1)).toBe(0);
  expect(await readdir(path.resolve(process.env.UPLOADS_DIR!))).toContain(recorded!.storedName);
});
