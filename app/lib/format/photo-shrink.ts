/*
 * Yard photos made smaller in the browser before they go up. A phone photo is often 4,000 px or
 * more on its long side and several megabytes; 2,560 px is plenty to judge a yard and the upload is
 * a fraction of the size. Drawing the photo on a canvas and encoding it again keeps only the pixels:
 * EXIF and every other metadata block (GPS location included) are left behind. createImageBitmap
 * with imageOrientation "from-image" applies the EXIF orientation first, so the photo stays upright.
 * The server still checks and re-encodes whatever arrives; anything that cannot be read here is
 * sent as it is and judged there.
 */

/** The long side of a photo as it is sent, px. */
export const SHRUNK_LONG_EDGE_PX = 2560;
// JPEG quality for photos of a yard: no visible loss at this size (common practice, no source).
const JPEG_QUALITY = 0.85;
const SHRINKABLE = new Set(["image/jpeg", "image/png", "image/webp"]);

/** The width and height a photo is drawn at: scaled down to the long edge, never up. */
export function shrunkSize(
  width: number,
  height: number,
  longEdgePx = SHRUNK_LONG_EDGE_PX,
): { width: number; height: number } {
  const scale = Math.min(1, longEdgePx / Math.max(width, height, 1));
  return { width: Math.max(1, Math.round(width * scale)), height: Math.max(1, Math.round(height * scale)) };
}

/** "IMG_2041.HEIC.png" → "IMG_2041.HEIC.jpg": the name the shrunk photo is sent under. */
export function shrunkName(name: string): string {
  const base = name.replace(/\.[A-Za-z0-9]{1,5}$/, "");
  return `${base || "photo"}.jpg`;
}

/** A smaller, upright JPEG without metadata; the original file when this browser cannot read it. */
export async function shrinkPhoto(file: File): Promise<File> {
  if (!SHRINKABLE.has(file.type) || typeof createImageBitmap !== "function") return file;
  let bitmap: ImageBitmap;
  try {
    bitmap = await createImageBitmap(file, { imageOrientation: "from-image" });
  } catch {
    return file;
  }
  try {
    const size = shrunkSize(bitmap.width, bitmap.height);
    const canvas = document.createElement("canvas");
    canvas.width = size.width;
    canvas.height = size.height;
    const context = canvas.getContext("2d");
    if (!context) return file;
    // JPEG has no transparency: a PNG's clear parts become white rather than black.
    context.fillStyle = "#ffffff";
    context.fillRect(0, 0, size.width, size.height);
    context.imageSmoothingQuality = "high";
    context.drawImage(bitmap, 0, 0, size.width, size.height);
    const blob = await new Promise<Blob | null>((resolve) => canvas.toBlob(resolve, "image/jpeg", JPEG_QUALITY));
    return blob
      ? new File([blob], shrunkName(file.name), { type: "image/jpeg", lastModified: file.lastModified })
      : file;
  } finally {
    bitmap.close();
  }
}
