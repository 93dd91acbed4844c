import { randomUUID } from "node:crypto";
import { mkdir, rm, writeFile, readFile, readdir, stat } from "node:fs/promises";
import path from "node:path";
import { fileTypeFromBuffer } from "file-type";
import { env } from "~/lib/env.server";

/*
 * Yard photos (OWASP File Upload Cheat Sheet): an allow-list checked against the file's own bytes,
 * size and count limits, generated names, kept outside public/ and served only through an
 * authorised route with nosniff.
 */
export const MAX_PHOTOS = 6;
export const MAX_PHOTO_BYTES = 10 * 1024 * 1024;
// Six full-size photos plus the form fields; anything bigger is refused before it is read.
export const MAX_FORM_BYTES = MAX_PHOTOS * MAX_PHOTO_BYTES + 1024 * 1024;
const ALLOWED = new Map([
  ["image/jpeg", "jpg"],
  ["image/png", "png"],
  ["image/webp", "webp"],
]);

// Markup or code hidden behind an image header (a polyglot) has no business in a yard photo.
const EMBEDDED_CODE = /<(script|html|svg|iframe|body|\?php)[\s>]/i;

export type CheckedPhoto = { bytes: Uint8Array; mimeType: string; extension: string; originalName: string };
export type PhotoCheck = { ok: true; photos: CheckedPhoto[] } | { ok: false; message: string };

/** Keeps a display label from a client's file name: no folders, no control characters, 80 chars. */
export function cleanOriginalName(name: string): string {
  const base = name.split(/[\\/]/).pop() ?? "";
  const cleaned = base.replace(/[\u0000-\u001f\u007f<>:"|?*]/g, "").replace(/^\.+/, "").trim();
  return (cleaned || "photo").slice(0, 80);
}

/** Checks a form's photos by their bytes: count, size, and an allowed image type. */
export async function checkPhotos(files: File[]): Promise<PhotoCheck> {
  const chosen = files.filter((f) => f.size > 0 || f.name !== "");
  if (chosen.length > MAX_PHOTOS) {
    return { ok: false, message: `Attach at most ${MAX_PHOTOS} photos (you chose ${chosen.length}).` };
  }
  const photos: CheckedPhoto[] = [];
  for (const file of chosen) {
    const label = cleanOriginalName(file.name);
    if (file.size === 0) return { ok: false, message: `"${label}" is empty.` };
    if (file.size > MAX_PHOTO_BYTES) {
      return { ok: false, message: `"${label}" is larger than 10 MB. Send a smaller photo.` };
    }
    const bytes = new Uint8Array(await file.arrayBuffer());
    const detected = await fileTypeFromBuffer(bytes);
    const extension = detected ? ALLOWED.get(detected.mime) : undefined;
    if (!detected || !extension) {
      return { ok: false, message: `"${label}" is not a JPEG, PNG or WebP photo.` };
    }
    // latin1 maps every byte to one character, so the pattern sees the raw bytes.
    if (EMBEDDED_CODE.test(Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength).toString("latin1"))) {
      return { ok: false, message: `"${label}" contains web page code as well as a picture. Send a plain photo.` };
    }
    photos.push({ bytes, mimeType: detected.mime, extension, originalName: label });
  }
  return { ok: true, photos };
}

const uploadsRoot = () => path.resolve(env.UPLOADS_DIR);

/** Writes checked photos under generated names; returns the names (delete them if the record fails). */
export async function storePhotos(photos: CheckedPhoto[]): Promise<string[]> {
  await mkdir(uploadsRoot(), { recursive: true });
  const names: string[] = [];
  for (const photo of photos) {
    const storedName = `${randomUUID()}.${photo.extension}`;
    await writeFile(path.join(uploadsRoot(), storedName), photo.bytes, { flag: "wx" });
    names.push(storedName);
  }
  return names;
}

export async function deleteStoredPhotos(names: string[]): Promise<void> {
  await Promise.all(names.map((n) => rm(path.join(uploadsRoot(), path.basename(n)), { force: true })));
}

/** Reads a stored photo; the name comes from the database, and basename() keeps it in the folder. */
export function readStoredPhoto(storedName: string): Promise<Buffer> {
  return readFile(path.join(uploadsRoot(), path.basename(storedName)));
}

/** Deletes files older than `olderThanMs` that no record names (left by a crash mid-submit). */
export async function sweepOrphanPhotos(knownNames: Set<string>, olderThanMs = 60 * 60_000): Promise<number> {
  let entries: string[];
  try {
    entries = await readdir(uploadsRoot());
  } catch {
    return 0;
  }
  let removed = 0;
  for (const name of entries) {
    if (knownNames.has(name)) continue;
    const info = await stat(path.join(uploadsRoot(), name));
    if (Date.now() - info.mtimeMs > olderThanMs) {
      await rm(path.join(uploadsRoot(), name), { force: true });
      removed += 1;
    }
  }
  return removed;
}
