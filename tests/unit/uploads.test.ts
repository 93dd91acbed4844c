import { readdir } from "node:fs/promises";
import path from "node:path";
import { crc32 } from "node:zlib";
import { expect, test } from "vitest";
import { FAKE_JPEG, TINY_JPEG, TINY_PNG } from "./support/images";
import {
  cleanOriginalName,
  deleteStoredPhotos,
  MAX_PHOTO_BYTES,
  readLeadForm,
  storePhotoBytes,
  storeReceivedPhotos,
} from "~/lib/platform/uploads.server";

const uploads = () => path.resolve(process.env.UPLOADS_DIR!);
const file = (bytes: Uint8Array<ArrayBuffer>, name: string, type = "image/jpeg") => new File([bytes], name, { type });

/** A lead form as a browser sends it (multipart), with the photos under "photos". */
function formRequest(photos: File[], fields: Record<string, string> = { customerName: "Pia" }) {
  const form = new FormData();
  for (const [k, v] of Object.entries(fields)) form.set(k, v);
  for (const p of photos) form.append("photos", p);
  return new Request("http://localhost/c/cinder-slate", { method: "POST", body: form });
}

async function receiveAndStore(photos: File[]) {
  const reading = await readLeadForm(formRequest(photos));
  if (!reading.ok) return reading;
  return storeReceivedPhotos(reading.photos);
}

const incomingLeft = async () => (await readdir(uploads())).filter((n) => n.startsWith("incoming-"));

test("a real PNG and JPEG pass, typed by their bytes, and are stored re-encoded under generated names", async () => {
  const result = await receiveAndStore([file(TINY_PNG, "yard.png", "image/png"), file(TINY_JPEG, "side.jpg")]);
  if (!("photos" in result) || !result.ok) throw new Error(JSON.stringify(result));
  expect(result.photos.map((p) => p.mimeType)).toEqual(["image/png", "image/jpeg"]);
  expect(result.photos.map((p) => p.storedName)).toEqual([
    expect.stringMatching(/^[0-9a-f-]{36}\.png$/),
    expect.stringMatching(/^[0-9a-f-]{36}\.jpg$/),
  ]);
  expect(await incomingLeft()).toEqual([]);
  await deleteStoredPhotos(result.photos.map((p) => p.storedName));
});

test("the form's text fields come through; a form without photos has none", async () => {
  const reading = await readLeadForm(formRequest([], { customerName: "Pia Lindqvist", town: "Millbrook Falls" }));
  expect(reading).toEqual({ ok: true, fields: { customerName: "Pia Lindqvist", town: "Millbrook Falls" }, photos: [] });
});

test("a text file renamed .jpg is refused (OWASP File Upload Cheat Sheet: check content, not the name)", async () => {
  const result = await receiveAndStore([file(new TextEncoder().encode("just some text, honestly"), "yard.jpg")]);
  expect(result).toEqual({ ok: false, message: '"yard.jpg" is not a JPEG, PNG or WebP photo.' });
  expect(await incomingLeft()).toEqual([]);
});

test("an HTML file claiming to be an image is refused", async () => {
  const result = await receiveAndStore([file(new TextEncoder().encode("<svg onload=alert(1)>"), "x.png", "image/png")]);
  expect(result.ok).toBe(false);
});

test("seven photos are refused while the form is read: six is the limit (413, naming the photos field)", async () => {
  const reading = await readLeadForm(
    formRequest(Array.from({ length: 7 }, (_, i) => file(TINY_PNG, `p${i}.png`, "image/png"))),
  );
  expect(reading).toEqual({ ok: false, status: 413, errors: { photos: "Attach at most 6 photos." } });
  expect(await incomingLeft()).toEqual([]);
});

test("a photo over 10 MB is refused while it is read (413), and nothing of it stays on disk", async () => {
  const big = new Uint8Array(MAX_PHOTO_BYTES + 1);
  big.set(TINY_PNG);
  const reading = await readLeadForm(formRequest([file(big, "huge.png", "image/png")]));
  expect(reading).toEqual({
    ok: false,
    status: 413,
    errors: { photos: "Each photo must be 10 MB or smaller. Send a smaller photo." },
  });
  expect(await incomingLeft()).toEqual([]);
});

test("names with ../ are harmless: the label loses its folders and the file gets a generated name", async () => {
  expect(cleanOriginalName("../../etc/passwd.png")).toBe("passwd.png");
  expect(cleanOriginalName("..\\..\\win.ini")).toBe("win.ini");
  expect(cleanOriginalName("...")).toBe("photo");
  const stored = await storePhotoBytes(TINY_PNG, "../../../escape.png");
  expect(stored.originalName).toBe("escape.png");
  expect(stored.storedName).toMatch(/^[0-9a-f-]{36}\.png$/);
  expect(await readdir(uploads())).toContain(stored.storedName);
  await deleteStoredPhotos([stored.storedName]);
});

test("a polyglot (a real PNG header with a script inside) is refused (OWASP File Upload Cheat Sheet)", async () => {
  const polyglot = new Uint8Array([...TINY_PNG, ...new TextEncoder().encode("<script>alert(1)</script>")]);
  const result = await receiveAndStore([file(polyglot, "trick.png", "image/png")]);
  expect(result).toEqual({
    ok: false,
    message: '"trick.png" contains web page code as well as a picture. Send a plain photo.',
  });
});

test("a file that carries JPEG markers but no picture is refused when decoding fails", async () => {
  const result = await receiveAndStore([file(FAKE_JPEG, "blank.jpg")]);
  expect(result).toEqual({
    ok: false,
    message: '"blank.jpg" could not be read as a picture (it may be damaged). Send a JPEG, PNG or WebP photo.',
  });
  expect(await incomingLeft()).toEqual([]);
});

test("a decompression bomb (a small PNG declaring 20,000 × 20,000 pixels) is refused before it is decoded", async () => {
  // A valid small PNG whose header (IHDR, with its CRC redone) claims 20,000 × 20,000 pixels.
  const bomb = Buffer.from(TINY_PNG);
  bomb.writeUInt32BE(20_000, 16);
  bomb.writeUInt32BE(20_000, 20);
  bomb.writeUInt32BE(crc32(bomb.subarray(12, 29)), 29);
  const result = await receiveAndStore([file(new Uint8Array(bomb), "bomb.png", "image/png")]);
  expect(result).toEqual({ ok: false, message: '"bomb.png" has more than 50 megapixels. Send a smaller photo.' });
});

test("photo files that no lead names are swept; recorded ones stay", async () => {
  const { sweepUnrecordedPhotos } = await import("~/lib/leads/leads.server");
  const orphan = await storePhotoBytes(TINY_PNG, "a.png");
  const other = await storePhotoBytes(TINY_PNG, "b.png");
  // Age 0: everything unrecorded counts as left behind.
  expect(await sweepUnrecordedPhotos(-1)).toBeGreaterThanOrEqual(2);
  const left = await readdir(uploads());
  expect(left).not.toContain(orphan.storedName);
  expect(left).not.toContain(other.storedName);

  const { createLead } = await import("~/lib/leads/leads.server");
  const { createTestPlanRecord } = await import("./support/leads");
  const { demoCompany } = await import("./support/demo");
  const { company } = await demoCompany();
  const { leadPhotos } = await import("~/db/schema");
  const { db } = await import("~/lib/platform/db.server");
  const kept = await storePhotoBytes(TINY_PNG, "c.png");
  await createLead({
    company,
    form: {
      customerName: "Pia Lindqvist",
      email: "pia@example.test",
      phone: "555 010 3344",
      street: "9 Fern St",
      town: "Millbrook Falls",
      buildWindow: "next-year",
      notes: "",
      consent: "on",
    },
    photos: [kept],
    origin: "http://localhost",
    snapshot: {
      record: createTestPlanRecord(),
      stoneName: "Test",
      bowlDiameterIn: 36,
      priceLowCents: null,
      priceHighCents: null,
      summary: [],
    },
  });
  const [recorded] = await db.select().from(leadPhotos);
  expect(await sweepUnrecordedPhotos(-1)).toBe(0);
  expect(await readdir(uploads())).toContain(recorded!.storedName);
});
