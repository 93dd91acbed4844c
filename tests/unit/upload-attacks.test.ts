/*
 * Attacks on the lead form's photo upload, sent through the form's own action (OWASP File Upload
 * Cheat Sheet: "rewrite the file", content checks, size limits, and file names that cannot mislead;
 * ASVS 4.0.3 V12.1 (sizes) and V12.3 (file names)).
 */
import { randomUUID } from "node:crypto";
import { readFile } from "node:fs/promises";
import path from "node:path";
import { eq } from "drizzle-orm";
import sharp from "sharp";
import { expect, test } from "vitest";
import { leadPhotos, leads } from "~/db/schema";
import { db } from "~/lib/platform/db.server";
import { action } from "~/routes/configurator";
import { demoCompany, routeArgs } from "./support/demo";
import { FAKE_JPEG, TINY_JPEG, TINY_PNG } from "./support/images";

const FIELDS = {
  customerName: "Rosalind Ferreira",
  phone: "(970) 555-0147",
  street: "14 Larkspur Lane",
  town: "Millbrook Falls",
  buildWindow: "this-season",
  notes: "",
  consent: "on",
  design: "units=14&courses=4&liner=firebrick",
};

let address = 0;
let n = 0;
async function send(photos: File[]) {
  const form = new FormData();
  for (const [k, v] of Object.entries({ ...FIELDS, email: `upload.attack.${++n}@example.test` })) form.set(k, v);
  for (const p of photos) form.append("photos", p);
  const raw = new Request("http://localhost/c/cinder-slate", { method: "POST", body: form });
  const body = await raw.arrayBuffer();
  address += 1;
  const request = new Request(raw.url, {
    method: "POST",
    body,
    headers: {
      ...Object.fromEntries(raw.headers),
      "Content-Length": String(body.byteLength),
      "X-Forwarded-For": `192.0.2.${address}`,
    },
  });
  return (await action(routeArgs(request, { companySlug: "cinder-slate" }))) as
    Response | { data: { errors: Record<string, string> }; init: ResponseInit };
}

async function storedPhotosOf(response: unknown) {
  expect(response).toBeInstanceOf(Response);
  const ref = (response as Response).headers.get("Location")!.split("/").pop()!;
  const [lead] = await db.select().from(leads).where(eq(leads.ref, ref));
  const rows = await db.select().from(leadPhotos).where(eq(leadPhotos.leadId, lead!.id));
  return Promise.all(
    rows.map(async (row) => ({
      row,
      bytes: await readFile(path.join(path.resolve(process.env.UPLOADS_DIR!), row.storedName)),
    })),
  );
}

const errorsOf = (result: unknown) => result as { data: { errors: Record<string, string> }; init: ResponseInit };

test("metadata smuggling: a yard photo's EXIF (GPS position, camera owner) is gone from the stored file", async () => {
  await demoCompany();
  const withExif = await sharp(Buffer.from(TINY_JPEG))
    .withMetadata({
      exif: {
        IFD0: { Copyright: "Owner Name 555-0100", Artist: "secret-artist" },
        IFD3: { GPSLatitudeRef: "N", GPSLatitude: "44/1 30/1 0/1" },
      },
    })
    .jpeg()
    .toBuffer();
  expect((await sharp(withExif).metadata()).exif).toBeDefined();
  const [stored] = await storedPhotosOf(
    await send([new File([new Uint8Array(withExif)], "yard.jpg", { type: "image/jpeg" })]),
  );
  const meta = await sharp(stored!.bytes).metadata();
  expect(meta.format).toBe("jpeg");
  expect(meta.exif).toBeUndefined();
  expect(stored!.bytes.toString("latin1")).not.toContain("secret-artist");
  expect(stored!.row.sizeBytes).toBe(stored!.bytes.byteLength);
});

test("a payload appended after the image data (an archive tail) is not stored", async () => {
  await demoCompany();
  const tail = Buffer.from("PK\u0003\u0004 hidden-archive-payload-7f3a", "latin1");
  const trailing = new Uint8Array([...TINY_PNG, ...tail]);
  const [stored] = await storedPhotosOf(await send([new File([trailing], "yard.png", { type: "image/png" })]));
  expect(stored!.bytes.toString("latin1")).not.toContain("hidden-archive-payload-7f3a");
  expect((await sharp(stored!.bytes).metadata()).format).toBe("png");
});

test("a file with image magic bytes that does not decode is refused, naming the photos field, and nothing is saved", async () => {
  await demoCompany();
  const before = (await db.select().from(leads)).length;
  const result = errorsOf(await send([new File([FAKE_JPEG], "yard.jpg", { type: "image/jpeg" })]));
  expect(result.init.status).toBe(400);
  expect(result.data.errors.photos).toBe(
    '"yard.jpg" could not be read as a picture (it may be damaged). Send a JPEG, PNG or WebP photo.',
  );
  expect((await db.select().from(leads)).length).toBe(before);
});

test("a file name with a right-to-left override cannot disguise its extension in the stored label", async () => {
  await demoCompany();
  // "yard\u202Egpj.exe" shows as "yardexe.jpg" where the override is honoured.
  const [stored] = await storedPhotosOf(
    await send([new File([TINY_PNG], "yard\u202Egpj.exe\u0007", { type: "image/png" })]),
  );
  expect(stored!.row.originalName).toBe("yardgpj.exe");
  expect(stored!.row.storedName).toMatch(/^[0-9a-f-]{36}\.png$/);
});

test("filling one contractor's photo storage for the day: past the daily cap a request with photos gets 429 naming the photos field, and nothing is saved", async () => {
  const { company } = await demoCompany();
  const [someLead] = await db.select().from(leads).where(eq(leads.companyId, company.id)).limit(1);
  // Today's earlier uploads, as recorded: 500 MB already taken in.
  // Only the recorded sizes count, so a row stands in for the day's earlier photos.
  const earlier = { storedName: `${randomUUID()}.png` };
  await db.insert(leadPhotos).values({
    companyId: company.id,
    leadId: someLead!.id,
    storedName: earlier.storedName,
    originalName: "earlier.png",
    mimeType: "image/png",
    sizeBytes: 500 * 1024 * 1024,
  });
  const before = (await db.select().from(leads)).length;
  const result = errorsOf(await send([new File([TINY_PNG], "yard.png", { type: "image/png" })]));
  expect(result.init.status).toBe(429);
  expect(result.data.errors.photos).toMatch(/all the photos it can take today/);
  expect((await db.select().from(leads)).length).toBe(before);
  // Without photos the request still goes through.
  expect(await send([])).toBeInstanceOf(Response);
  await db.delete(leadPhotos).where(eq(leadPhotos.storedName, earlier.storedName));
});

test("an oversized photo is refused while it streams in: the server stops reading the body near the 10 MB photo limit", async () => {
  await demoCompany();
  const boundary = "----emberwright-test-boundary";
  const head = Buffer.from(
    Object.entries({ ...FIELDS, email: "stream.limit@example.test" })
      .map(([k, v]) => `--${boundary}\r\nContent-Disposition: form-data; name="${k}"\r\n\r\n${v}\r\n`)
      .join("") +
      `--${boundary}\r\nContent-Disposition: form-data; name="photos"; filename="huge.png"\r\nContent-Type: image/png\r\n\r\n`,
  );
  const photoBytes = 40 * 1024 * 1024;
  const tail = Buffer.from(`\r\n--${boundary}--\r\n`);
  let pulled = 0;
  const chunk = new Uint8Array(64 * 1024);
  let sent = 0;
  const body = new ReadableStream<Uint8Array>({
    start(controller) {
      controller.enqueue(new Uint8Array(head));
      pulled += head.byteLength;
    },
    pull(controller) {
      if (sent >= photoBytes) {
        controller.enqueue(new Uint8Array(tail));
        controller.close();
        return;
      }
      controller.enqueue(chunk);
      sent += chunk.byteLength;
      pulled += chunk.byteLength;
    },
  });
  const request = new Request("http://localhost/c/cinder-slate", {
    method: "POST",
    body,
    duplex: "half",
    headers: {
      "Content-Type": `multipart/form-data; boundary=${boundary}`,
      "Content-Length": String(head.byteLength + photoBytes + tail.byteLength),
      "X-Forwarded-For": "192.0.2.250",
    },
  } as RequestInit);
  const result = errorsOf(await action(routeArgs(request, { companySlug: "cinder-slate" })));
  expect(result.init.status).toBe(413);
  expect(result.data.errors.photos).toBe("Each photo must be 10 MB or smaller. Send a smaller photo.");
  // Read up to the limit plus what the stream had queued; never the 40 MB.
  expect(pulled).toBeLessThan(12 * 1024 * 1024);
});
