import { existsSync } from "node:fs";
import { createRequire } from "node:module";
import path from "node:path";
import type PDFDocument from "pdfkit";

/*
 * Names and addresses in any script on the cut sheet. pdfkit's built-in Helvetica encodes only
 * WinAnsi (Windows-1252, PDF 32000-1:2008 Annex D), so "Łódź", "Nguyễn", "王小明" or an emoji
 * come out as wrong letters. Text with anything outside WinAnsi is set in embedded Noto fonts
 * (SIL Open Font License), chosen character by character from the ones installed:
 *   - @fontsource/noto-sans (a dependency): Latin Extended, Greek, Cyrillic, Vietnamese, Devanagari,
 *     shipped as unicode-range subsets, so each subset is one more candidate;
 *   - whole CJK and emoji fonts when their packages are installed (@expo-google-fonts/noto-sans-sc,
 *     -noto-sans-kr, -noto-emoji ship full TTF files), or Debian's fonts-noto-cjk;
 * A character no installed font has is set in the widest candidate and shows as an empty box
 * (.notdef), never as a different letter. Without any of them the sheet still renders.
 */

type Doc = InstanceType<typeof PDFDocument>;
type FontkitFont = { postscriptName: string; hasGlyphForCodePoint(codePoint: number): boolean };
type Face = { key: string; file: string; family?: string; font: FontkitFont };
type Weight = "regular" | "bold";

const requireHere = createRequire(import.meta.url);
// fontkit comes with pdfkit; resolving it from there uses the very copy pdfkit embeds with.
const fontkit = (() => {
  try {
    return createRequire(requireHere.resolve("pdfkit"))("fontkit") as {
      openSync(
        file: string,
        family?: string,
      ): FontkitFont & { fonts?: FontkitFont[]; getFont?(name: string): FontkitFont };
    };
  } catch {
    return null;
  }
})();

function packageFile(pkg: string, file: string): string | null {
  try {
    const candidate = path.join(path.dirname(requireHere.resolve(`${pkg}/package.json`)), file);
    return existsSync(candidate) ? candidate : null;
  } catch {
    return null;
  }
}

const NOTO_SANS_SUBSETS = [
  "latin",
  "latin-ext",
  "cyrillic",
  "cyrillic-ext",
  "greek",
  "greek-ext",
  "vietnamese",
  "devanagari",
];

function candidateFiles(weight: Weight): { file: string | null; family?: string }[] {
  const w = weight === "bold" ? "700" : "400";
  const expo = weight === "bold" ? "700Bold" : "400Regular";
  return [
    ...NOTO_SANS_SUBSETS.map((s) => ({
      file: packageFile("@fontsource/noto-sans", `files/noto-sans-${s}-${w}-normal.woff`),
    })),
    { file: packageFile("@expo-google-fonts/noto-sans-sc", `${expo}/NotoSansSC_${expo}.ttf`) },
    { file: packageFile("@expo-google-fonts/noto-sans-kr", `${expo}/NotoSansKR_${expo}.ttf`) },
    { file: packageFile("@expo-google-fonts/noto-emoji", "400Regular/NotoEmoji_400Regular.ttf") },
    // Debian's fonts-noto-cjk: one collection for Chinese, Japanese and Korean.
    {
      file: existsSync(`/usr/share/fonts/opentype/noto/NotoSansCJK-${weight === "bold" ? "Bold" : "Regular"}.ttc`)
        ? `/usr/share/fonts/opentype/noto/NotoSansCJK-${weight === "bold" ? "Bold" : "Regular"}.ttc`
        : null,
      family: `NotoSansCJKsc-${weight === "bold" ? "Bold" : "Regular"}`,
    },
  ];
}

const facesByWeight = new Map<Weight, Face[]>();

/** The installed fallback faces for a weight, in order of preference (loaded once). */
export function fallbackFaces(weight: Weight): Face[] {
  const known = facesByWeight.get(weight);
  if (known) return known;
  const faces: Face[] = [];
  if (fontkit) {
    for (const [i, { file, family }] of candidateFiles(weight).entries()) {
      if (!file) continue;
      try {
        const opened = fontkit.openSync(file, family);
        faces.push({ key: `wide-${weight}-${i}`, file, family, font: opened });
      } catch {
        // A damaged or unreadable font file is skipped; the others still serve.
      }
    }
  }
  facesByWeight.set(weight, faces);
  return faces;
}

// Windows-1252's printable characters: what the built-in fonts can set (PDF 32000-1:2008 Annex D).
const WIN_ANSI_EXTRA = "€‚ƒ„…†‡ˆ‰Š‹ŒŽ‘’“”•–—˜™š›œžŸ";
export function isWinAnsi(char: string): boolean {
  const c = char.codePointAt(0)!;
  return (
    (c >= 0x20 && c <= 0x7e) ||
    (c >= 0xa0 && c <= 0xff) ||
    c === 0x0a ||
    c === 0x0d ||
    c === 0x09 ||
    WIN_ANSI_EXTRA.includes(char)
  );
}

export type TextRun = { text: string; face: Face | null };

/**
 * Splits text into runs, each set in one font: null means the document's own built-in font.
 * Text the built-in font can set is one run; otherwise one fallback face that has every
 * character is preferred (one typeface reads better), else the first face that has each character.
 */
export function splitRuns(text: string, weight: Weight): TextRun[] {
  const chars = [...text];
  if (chars.every(isWinAnsi)) return [{ text, face: null }];
  const faces = fallbackFaces(weight);
  if (faces.length === 0) return [{ text, face: null }];
  const has = (face: Face, ch: string) => /\s/.test(ch) || face.font.hasGlyphForCodePoint(ch.codePointAt(0)!);
  const whole = faces.find((face) => chars.every((ch) => has(face, ch)));
  if (whole) return [{ text, face: whole }];
  const runs: TextRun[] = [];
  for (const ch of chars) {
    const face = isWinAnsi(ch) ? null : (faces.find((f) => has(f, ch)) ?? faces[0]!);
    const last = runs.at(-1);
    if (last && (last.face === face || /\s/.test(ch))) last.text += ch;
    else runs.push({ text: ch, face });
  }
  return runs;
}

/**
 * Makes a pdfkit document set any text in fonts that have its characters: text(),
 * heightOfString() and widthOfString() switch to a fallback face where the built-in font (the one
 * chosen with font()) cannot set the text, and back afterwards. Drawing code stays as it is.
 */
export function withWideText(doc: Doc): Doc {
  const original = {
    text: doc.text.bind(doc),
    heightOfString: doc.heightOfString.bind(doc),
    widthOfString: doc.widthOfString.bind(doc),
  };
  const state = doc as unknown as { _font?: { name?: string } };
  const currentName = () => state._font?.name ?? "Helvetica";
  const weightOf = (name: string): Weight => (/bold/i.test(name) ? "bold" : "regular");
  // Only text set in a built-in font is rerouted; pdfkit measures words with widthOfString while it
  // lays out text in a fallback face, and those calls must reach pdfkit untouched.
  const isBuiltIn = (name: string) => /^(Helvetica|Times|Courier|Symbol|ZapfDingbats)/.test(name);
  const loaded = new Set<string>();
  const families = (doc as unknown as { _fontFamilies: Record<string, unknown> })._fontFamilies;
  const selectFace = (face: Face) => {
    if (loaded.has(face.key)) {
      doc.font(face.key);
      return;
    }
    doc.registerFont(face.key, face.file, face.family as string);
    loaded.add(face.key);
    // pdfkit takes a new font for one it already has when the PostScript name and name records
    // match, and every unicode-range subset of one typeface shares them ("NotoSans-Regular"):
    // hide the open one while this subset opens, so each subset is embedded on its own.
    const name = face.font.postscriptName;
    const open = families[name];
    delete families[name];
    doc.font(face.key);
    if (open) families[name] = open;
  };
  /** Runs `work` with the face that sets the whole text (or the widest one), restoring the font. */
  const measureWith = <T>(text: string, work: () => T): T => {
    const builtIn = currentName();
    if (!isBuiltIn(builtIn)) return work();
    const runs = splitRuns(String(text ?? ""), weightOf(builtIn));
    const face = runs.find((r) => r.face)?.face;
    if (!face) return work();
    selectFace(face);
    try {
      return work();
    } finally {
      doc.font(builtIn);
    }
  };

  doc.heightOfString = ((text: string, options?: object) =>
    measureWith(text, () => original.heightOfString(text, options))) as Doc["heightOfString"];
  doc.widthOfString = ((text: string, options?: object) =>
    measureWith(text, () => original.widthOfString(text, options))) as Doc["widthOfString"];
  const withFace = <T>(face: Face | null, builtIn: string, work: () => T): T => {
    if (face) selectFace(face);
    else doc.font(builtIn);
    try {
      return work();
    } finally {
      doc.font(builtIn);
    }
  };
  doc.text = ((text: string, x?: number | object, y?: number, options?: object) => {
    const builtIn = currentName();
    if (typeof text !== "string" || !isBuiltIn(builtIn)) return original.text(text, x as number, y as number, options);
    const runs = splitRuns(text, weightOf(builtIn));
    if (runs.length === 1 && runs[0]!.face === null) return original.text(text, x as number, y as number, options);
    const opts = ((typeof x === "object" ? x : options) ?? {}) as PDFKit.Mixins.TextOptions;
    const left = typeof x === "number" ? x : doc.x;
    const top = typeof y === "number" ? y : doc.y;
    // One face for all of it: pdfkit lays it out (wrapping included) as usual.
    if (runs.length === 1) return withFace(runs[0]!.face, builtIn, () => original.text(text, left, top, opts));
    // Mixed faces: set each run at its own x on one line. pdfkit's "continued" text loses track of
    // the font between runs, so the line is placed by hand from the runs' measured widths.
    const widths = runs.map((run) => withFace(run.face, builtIn, () => original.widthOfString(run.text)));
    const total = widths.reduce((a, b) => a + b, 0);
    if (opts.width !== undefined && total > opts.width) {
      // Too long for one line: the face with the most of its characters wraps it (the rest show as boxes).
      const best = runs.reduce((a, b) => (b.face && b.text.length > (a.face ? a.text.length : 0) ? b : a), runs[0]!);
      return withFace(best.face, builtIn, () => original.text(text, left, top, opts));
    }
    let cursor = left;
    if (opts.width !== undefined && opts.align === "right") cursor = left + opts.width - total;
    if (opts.width !== undefined && opts.align === "center") cursor = left + (opts.width - total) / 2;
    // Every run on the built-in font's baseline, whatever each face's ascent.
    const fonts = doc as unknown as { _font: { ascender: number }; _fontSize: number };
    const baseline = top + (fonts._font.ascender / 1000) * fonts._fontSize;
    let lineHeight = doc.currentLineHeight(true);
    runs.forEach((run, i) => {
      withFace(run.face, builtIn, () => {
        original.text(run.text, cursor, baseline, { lineBreak: false, baseline: "alphabetic" });
        lineHeight = Math.max(lineHeight, doc.currentLineHeight(true));
      });
      cursor += widths[i]!;
    });
    doc.x = left;
    doc.y = top + lineHeight;
    return doc;
  }) as Doc["text"];
  return doc;
}
