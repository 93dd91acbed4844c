/*
 * Names and addresses in other scripts on the cut sheet PDF. The built-in PDF fonts encode only
 * WinAnsi (PDF 32000-1:2008 Annex D), so anything else used to come out as wrong letters; the text
 * is read back with pdf-parse (the PDF's ToUnicode maps), so a garbled name fails the comparison.
 */
import { eq } from "drizzle-orm";
import { PDFParse } from "pdf-parse";
import { beforeAll, expect, test } from "vitest";
import { leads, users } from "~/db/schema";
import { db } from "~/lib/platform/db.server";
import { renderCutSheetPdf } from "~/lib/cut-sheet/cut-sheet-pdf.server";
import { loadCutSheet, type CutSheet } from "~/lib/cut-sheet/cut-sheet.server";
import type { SessionUser } from "~/lib/auth/session.server";
import { demoCompany } from "./support/demo";

let sheet: CutSheet;
beforeAll(async () => {
  const { company } = await demoCompany();
  const [lead] = await db.select().from(leads).where(eq(leads.ref, "demo-cinder-slate-10"));
  const [owner] = await db.select().from(users).where(eq(users.email, "owner@cinder-slate.test"));
  const loaded = await loadCutSheet({ ...owner!, companyId: company.id } as unknown as SessionUser, lead!.id);
  if (!loaded) throw new Error("the demo lead's cut sheet should load for its owner");
  sheet = loaded;
});

async function pdfText(overrides: Partial<CutSheet>): Promise<string> {
  const pdf = await renderCutSheetPdf({ ...sheet, ...overrides });
  const parser = new PDFParse({ data: new Uint8Array(pdf) });
  const { text } = await parser.getText();
  await parser.destroy();
  return text.replace(/\s+/g, " ");
}

test("a homeowner named in Polish, Vietnamese, Norwegian, Greek and Russian letters gets their name and town on the PDF as written", async () => {
  const text = await pdfText({ customerName: "Łucja Nguyễn-Ødegård", street: "ул. Садовая 5", town: "Αθήνα" });
  expect(text).toContain("Łucja Nguyễn-Ødegård");
  expect(text).toContain("ул. Садовая 5, Αθήνα");
});

// Imported late, so the first test above also runs (and fails) on a build without this module.
const fonts = await import("~/lib/platform/pdf-fonts.server").catch(() => null);

test("plain Latin text stays in the built-in font: one run, no embedded face", () => {
  const { splitRuns } = fonts!;
  expect(splitRuns("Tobias Wren, 11 Cinderbrook Lane · 36 ½ in × 4°", "regular")).toEqual([
    { text: "Tobias Wren, 11 Cinderbrook Lane · 36 ½ in × 4°", face: null },
  ]);
});

// Needs a CJK font: @expo-google-fonts/noto-sans-sc (npm) or Debian's fonts-noto-cjk.
// The CJK font ships as a dependency (@expo-google-fonts/noto-sans-sc), so this never skips.
test("a homeowner named in Chinese and Japanese gets their name on the PDF as written", async () => {
  const text = await pdfText({ customerName: "王小明 (やまだ)", town: "東京" });
  expect(text).toContain("王小明 (やまだ)");
  expect(text).toContain("東京");
});
