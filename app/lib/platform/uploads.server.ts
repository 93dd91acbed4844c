import { randomUUID } from "node:crypto";
import { createReadStream } from "node:fs";
import { mkdir, readdir, readFile, rm, stat, writeFile } from "node:fs/promises";
import path from "node:path";
import { Readable } from "node:stream";
import {
  FormDataParseError,
  MaxFilesExceededError,
  MaxFileSizeExceededError,
  MaxTotalSizeExceededError,
  parseFormData,
  type FileUpload,
} from "@remix-run/form-data-parser";
import { fileTypeFromFile } from "file-type";
import sharp from "sharp";
import { env } from "~/lib/platform/env.server";

/*
 * Yard photos (OWASP File Upload Cheat Sheet): the lead form is read by a streaming multipart
 * parser that stops at the count and size limits as the bytes arrive, each photo goes to disk as
 * soon as it has been read, an allow-list is checked against the file's own bytes, and every image
 * is decoded and encoded again (sharp), so metadata, anything appended after the image data and any
 * markup hidden in it are gone. Stored under generated names outside public/, served only through
 * an authorised route with nosniff.
 */
export const MAX_PHOTOS = 6;
export const MAX_PHOTO_BYTES = 10 * 1024 * 1024;
// Six full-size photos plus the form fields; anything bigger is refused as it is read.
export const MAX_FORM_BYTES = MAX_PHOTOS * MAX_PHOTO_BYTES + 1024 * 1024;
/** Photo storage one company may take in on any rolling 24 hours (re-encoded sizes). */
export const MAX_COMPANY_PHOTO_BYTES_PER_DAY = 500 * 1024 * 1024;
// 50 megapixels holds any phone photo; the decoder refuses bigger before it allocates them.
const MAX_PIXELS = 50_000_000;
// Long edge of a stored photo: plenty to judge a yard, a fraction of the memory and disk.
const LONG_EDGE_PX = 3000;
// Lead forms read at the same time; the rest wait, their bodies held back in the socket.
const UPLOAD_SLOTS = 4;

const ALLOWED = new Map([
  ["image/jpeg", "jpg"],
  ["image/png", "png"],
  ["image/webp", "webp"],
]);

// Markup or code hidden behind an image header (a polyglot) has no business in a yard photo.
const EMBEDDED_CODE = /<(script|html|svg|iframe|body|\?php)[\s>]/i;

/** A photo as the parser left it on disk, not yet checked. */
export type ReceivedPhoto = { tempPath: string; originalName: string; size: number };
/** A checked, re-encoded photo under its generated name. */
export type StoredPhoto = { storedName: string; mimeType: string; sizeBytes: number; originalName: string };

export type LeadFormReading =
  | { ok: true; fields: Record<string, string>; photos: ReceivedPhoto[] }
  | { ok: false; status: 400 | 413; errors: Record<string, string> };

/**
 * Keeps a display label from a client's file name: no folders, no control or bidi characters
 * (an RLO can make "gpj.exe" read "exe.jpg"), none of <>:"|?*, at most 80 characters.
 */
export function cleanOriginalName(name: string): string {
  const base = name.split(/[\\/]/).pop() ?? "";
  const cleaned = base
    .replace(/[\u0000-\u001f\u007f-\u009f\u061c\u200b-\u200f\u2028-\u202e\u2066-\u2069\ufeff<>:"|?*]/g, "")
    .replace(/^\.+/, "")
    .trim();
  return (cleaned || "photo").slice(0, 80);
}

const uploadsRoot = () => path.resolve(env.UPLOADS_DIR);

let busySlots = 0;
const waitingForSlot: (() => void)[] = [];
async function withUploadSlot<T>(work: () => Promise<T>): Promise<T> {
  if (busySlots >= UPLOAD_SLOTS) await new Promise<void>((resolve) => waitingForSlot.push(resolve));
  else busySlots += 1;
  try {
    return await work();
  } finally {
    const next = waitingForSlot.shift();
    if (next) next();
    else busySlots -= 1;
  }
}

/**
 * Reads the lead form: text fields into memory, each photo to a temporary file as soon as the
 * parser has it. Too many photos, one too large or a body over the total limit stop the reading
 * at once (413), and nothing received so far is kept.
 */
export async function readLeadForm(request: Request): Promise<LeadFormReading> {
  await mkdir(uploadsRoot(), { recursive: true });
  const photos: ReceivedPhoto[] = [];
  const keepPhoto = async (file: FileUpload) => {
    // An empty file input still sends a part with no name and no bytes.
    if (file.fieldName !== "photos" || (file.size === 0 && file.name === "")) return null;
    const tempPath = path.join(uploadsRoot(), `incoming-${randomUUID()}`);
    await writeFile(tempPath, Readable.fromWeb(file.stream() as import("node:stream/web").ReadableStream), {
      flag: "wx",
    });
    photos.push({ tempPath, originalName: cleanOriginalName(file.name), size: file.size });
    return null;
  };
  try {
    const form = await withUploadSlot(() =>
      parseFormData(
        request,
        { maxFiles: MAX_PHOTOS, maxFileSize: MAX_PHOTO_BYTES, maxTotalSize: MAX_FORM_BYTES, maxParts: 60 },
        keepPhoto,
      ),
    );
    const fields = Object.fromEntries(
      [...form.entries()].filter((e): e is [string, string] => typeof e[1] === "string"),
    );
    return { ok: true, fields, photos };
  } catch (error) {
    await discardReceivedPhotos(photos);
    if (error instanceof MaxFilesExceededError)
      return { ok: false, status: 413, errors: { photos: `Attach at most ${MAX_PHOTOS} photos.` } };
    if (error instanceof MaxFileSizeExceededError) {
      return {
        ok: false,
        status: 413,
        errors: { photos: "Each photo must be 10 MB or smaller. Send a smaller photo." },
      };
    }
    if (error instanceof MaxTotalSizeExceededError) {
      return {
        ok: false,
        status: 413,
        errors: { photos: `The request is too large: attach at most ${MAX_PHOTOS} photos of 10 MB each.` },
      };
    }
    if (error instanceof FormDataParseError || (error as Error)?.name?.endsWith("ExceededError")) {
      return { ok: false, status: 400, errors: { form: "We could not read that form. Please try again." } };
    }
    throw error;
  }
}

export async function discardReceivedPhotos(photos: ReceivedPhoto[]): Promise<void> {
  await Promise.all(photos.map((p) => rm(p.tempPath, { force: true })));
}

/** Whether a file holds web page markup anywhere, read in chunks (overlapping, so no tag is split). */
async function containsMarkup(filePath: string): Promise<boolean> {
  let tail = "";
  for await (const chunk of createReadStream(filePath, { highWaterMark: 64 * 1024 })) {
    // latin1 maps every byte to one character, so the pattern sees the raw bytes.
    const text = tail + (chunk as Buffer).toString("latin1");
    if (EMBEDDED_CODE.test(text)) return true;
    tail = text.slice(-16);
  }
  return false;
}

/** The quick checks on received photos (before any decoding): not empty, an allowed type by its bytes, no markup. */
export async function checkReceivedPhotos(
  photos: ReceivedPhoto[],
): Promise<{ ok: true; types: string[] } | { ok: false; message: string }> {
  const types: string[] = [];
  for (const photo of photos) {
    const label = photo.originalName;
    if (photo.size === 0) return { ok: false, message: `"${label}" is empty.` };
    const detected = await fileTypeFromFile(photo.tempPath);
    if (!detected || !ALLOWED.has(detected.mime))
      return { ok: false, message: `"${label}" is not a JPEG, PNG or WebP photo.` };
    if (await containsMarkup(photo.tempPath)) {
      return { ok: false, message: `"${label}" contains web page code as well as a picture. Send a plain photo.` };
    }
    types.push(detected.mime);
  }
  return { ok: true, types };
}

/**
 * Checks received photos and stores each one decoded and encoded again: EXIF (GPS position,
 * camera serial), comments, ICC profiles and bytes appended after the image do not survive, and
 * a file that does not decode is refused. Temporary files are removed either way; on refusal
 * nothing is kept.
 */
export async function storeReceivedPhotos(
  photos: ReceivedPhoto[],
): Promise<{ ok: true; photos: StoredPhoto[] } | { ok: false; message: string }> {
  const stored: StoredPhoto[] = [];
  try {
    const check = await checkReceivedPhotos(photos);
    if (!check.ok) return check;
    for (const [i, photo] of photos.entries()) {
      const mimeType = check.types[i]!;
      const extension = ALLOWED.get(mimeType)!;
      const storedName = `${randomUUID()}.${extension}`;
      const target = path.join(uploadsRoot(), storedName);
      let image = sharp(photo.tempPath, { limitInputPixels: MAX_PIXELS, failOn: "error" })
        // Turn the pixels upright by the EXIF orientation before the EXIF is dropped.
        .rotate()
        .resize({ width: LONG_EDGE_PX, height: LONG_EDGE_PX, fit: "inside", withoutEnlargement: true });
      image =
        mimeType === "image/jpeg"
          ? image.jpeg({ quality: 85 })
          : mimeType === "image/png"
            ? image.png()
            : image.webp({ quality: 85 });
      try {
        const info = await image.toFile(target);
        stored.push({ storedName, mimeType, sizeBytes: info.size, originalName: photo.originalName });
      } catch (error) {
        await rm(target, { force: true });
        const tooBig = /pixel limit/i.test(String((error as Error)?.message));
        return {
          ok: false,
          message: tooBig
            ? `"${photo.originalName}" has more than 50 megapixels. Send a smaller photo.`
            : `"${photo.originalName}" could not be read as a picture (it may be damaged). Send a JPEG, PNG or WebP photo.`,
        };
      }
    }
    return { ok: true, photos: stored };
  } finally {
    await discardReceivedPhotos(photos);
    if (stored.length !== photos.length) await deleteStoredPhotos(stored.map((p) => p.storedName));
  }
}

/** Stores an image held in memory through the same checks and re-encoding (seed data, tests). */
export async function storePhotoBytes(bytes: Uint8Array, originalName: string): Promise<StoredPhoto> {
  await mkdir(uploadsRoot(), { recursive: true });
  const tempPath = path.join(uploadsRoot(), `incoming-${randomUUID()}`);
  await writeFile(tempPath, bytes, { flag: "wx" });
  const result = await storeReceivedPhotos([
    { tempPath, originalName: cleanOriginalName(originalName), size: bytes.byteLength },
  ]);
  if (!result.ok) throw new Error(result.message);
  return result.photos[0]!;
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
    const info = await stat(path.join(uploadsRoot(), name)).catch(() => null);
    if (info && Date.now() - info.mtimeMs > olderThanMs) {
      await rm(path.join(uploadsRoot(), name), { force: true });
      removed += 1;
    }
  }
  return removed;
}
