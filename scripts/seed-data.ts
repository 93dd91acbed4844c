import type { CatalogKind } from "~/db/schema";

/*
 * The demo scenario. Every company, person, product name and price here is invented.
 */

export const DEMO_PASSWORD = "ember-demo-2026";

type SeedItem = {
  kind: CatalogKind;
  name: string;
  colourName?: string;
  colourHex?: string;
  faceIn?: number;
  backIn?: number;
  depthIn?: number;
  heightIn?: number;
  lengthIn?: number;
  widthIn?: number;
  thicknessIn?: number;
  diameterIn?: number;
  priceCents: number;
};

export type SeedCompany = {
  slug: string;
  name: string;
  email: string;
  phone: string;
  town: string;
  timeZone: string;
  consultFeeCents: number;
  setbackFt: number;
  labourRateCents: number;
  overheadPct: number;
  marginPct: number;
  priceSpreadPct: number;
  staff: { email: string; name: string; role: "owner" | "estimator" | "crew" }[];
  catalog: SeedItem[];
};

export const DEMO_COMPANIES: SeedCompany[] = [
  {
    slug: "cinder-slate",
    name: "Cinder & Slate Outdoor Works",
    email: "office@cinder-slate.test",
    phone: "(555) 014-2290",
    town: "Millbrook Falls",
    timeZone: "America/Chicago",
    consultFeeCents: 15000,
    setbackFt: 25,
    labourRateCents: 8500,
    overheadPct: 15,
    marginPct: 22,
    priceSpreadPct: 12,
    staff: [
      { email: "owner@cinder-slate.test", name: "Maren Okafor", role: "owner" },
      { email: "estimator@cinder-slate.test", name: "Theo Brandvold", role: "estimator" },
      { email: "crew@cinder-slate.test", name: "Dario Quist", role: "crew" },
    ],
    catalog: [
      { kind: "wall-unit", name: "Hearthline Taper", colourName: "Ember Blend", colourHex: "#8f6b58", faceIn: 12, backIn: 8, depthIn: 8, heightIn: 4, priceCents: 485 },
      { kind: "wall-unit", name: "Ridgeback Taper", colourName: "Granite Grey", colourHex: "#8a8782", faceIn: 11.5, backIn: 7.75, depthIn: 7, heightIn: 4, priceCents: 445 },
      { kind: "wall-unit", name: "Kilnstone Grand Taper", colourName: "Charcoal", colourHex: "#4d4946", faceIn: 12, backIn: 8.75, depthIn: 9, heightIn: 6, priceCents: 740 },
      { kind: "wall-unit", name: "Fieldcut Taper", colourName: "Sandstone Tan", colourHex: "#b79d7c", faceIn: 11, backIn: 7.5, depthIn: 7.5, heightIn: 3.5, priceCents: 395 },
      { kind: "wall-unit", name: "Plainface Block", colourName: "Limestone", colourHex: "#c9c0b0", faceIn: 12, backIn: 12, depthIn: 8, heightIn: 4, priceCents: 360 },
      { kind: "wall-unit", name: "Quarry Square", colourName: "Slate Brown", colourHex: "#6b5a4e", faceIn: 16, backIn: 16, depthIn: 8, heightIn: 6, priceCents: 690 },
      { kind: "cap", name: "Sill Cap 16", colourName: "Charcoal", colourHex: "#55504c", lengthIn: 16, depthIn: 12, thicknessIn: 2.5, priceCents: 950 },
      { kind: "cap", name: "Broad Cap 20", colourName: "Ember Blend", colourHex: "#94705c", lengthIn: 20, depthIn: 13, thicknessIn: 3, priceCents: 1420 },
      { kind: "cap", name: "Bluestone-look Cap 18", colourName: "Blue Grey", colourHex: "#6c7379", lengthIn: 18, depthIn: 12, thicknessIn: 2.5, priceCents: 1280 },
      { kind: "steel-ring", name: "Heavy Ring 36", colourName: "Black steel", colourHex: "#2a2a2a", diameterIn: 36, heightIn: 10, priceCents: 18900 },
      { kind: "steel-ring", name: "Heavy Ring 42", colourName: "Black steel", colourHex: "#2a2a2a", diameterIn: 42, heightIn: 10, priceCents: 22900 },
      { kind: "firebrick", name: "Firebrick straight", colourName: "Buff", colourHex: "#d9c39a", lengthIn: 9, widthIn: 4.5, heightIn: 2.5, priceCents: 310 },
      { kind: "paver", name: "Courtyard Paver 6×9", colourName: "Autumn Blend", colourHex: "#a07d63", lengthIn: 9, widthIn: 6, thicknessIn: 2.375, priceCents: 95 },
      { kind: "paver", name: "Courtyard Paver 12×12", colourName: "Pewter", colourHex: "#8d8b87", lengthIn: 12, widthIn: 12, thicknessIn: 2.375, priceCents: 240 },
      { kind: "border-unit", name: "Rim Border 4×8", colourName: "Charcoal", colourHex: "#4f4a46", lengthIn: 8, widthIn: 4, thicknessIn: 2.375, priceCents: 80 },
      { kind: "border-unit", name: "Rim Border 6×12", colourName: "Charcoal", colourHex: "#4f4a46", lengthIn: 12, widthIn: 6, thicknessIn: 2.375, priceCents: 165 },
      { kind: "aggregate", name: "Crushed base 3/4 in minus", priceCents: 4800 },
      { kind: "adhesive", name: "Masonry adhesive 10.1 oz", priceCents: 850 },
      { kind: "bedding-sand", name: "Concrete sand", priceCents: 4200 },
      { kind: "joint-sand", name: "Polymeric joint sand 50 lb", priceCents: 2900 },
    ],
  },
  {
    slug: "north-ridge",
    name: "North Ridge Hearth & Patio",
    email: "hello@north-ridge.test",
    phone: "(555) 017-5521",
    town: "Cedar Hollow",
    timeZone: "America/Denver",
    consultFeeCents: 12500,
    setbackFt: 20,
    labourRateCents: 7800,
    overheadPct: 12,
    marginPct: 18,
    priceSpreadPct: 15,
    staff: [{ email: "owner@north-ridge.test", name: "Ilse Marchetti", role: "owner" }],
    catalog: [
      { kind: "wall-unit", name: "Timberline Taper", colourName: "Canyon Red", colourHex: "#8c5443", faceIn: 12, backIn: 8.25, depthIn: 7.5, heightIn: 4, priceCents: 470 },
      { kind: "cap", name: "Ridge Cap 18", colourName: "Slate", colourHex: "#5b6066", lengthIn: 18, depthIn: 12, thicknessIn: 2.5, priceCents: 1190 },
      { kind: "steel-ring", name: "Camp Ring 38", colourName: "Black steel", colourHex: "#2a2a2a", diameterIn: 38, heightIn: 10, priceCents: 19900 },
      { kind: "aggregate", name: "Road base", priceCents: 4500 },
      { kind: "adhesive", name: "Block glue", priceCents: 790 },
    ],
  },
];
