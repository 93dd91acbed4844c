import { sql } from "drizzle-orm";
import { index, integer, real, sqliteTable, text, uniqueIndex } from "drizzle-orm/sqlite-core";

/*
 * Every company-owned row carries company_id; every query in app/lib scopes by it.
 * Lengths are inches (real), money integer cents, times ISO-8601 UTC text.
 */

const createdAt = () =>
  text("created_at")
    .notNull()
    .default(sql`(strftime('%Y-%m-%dT%H:%M:%fZ','now'))`);

export const companies = sqliteTable("companies", {
  id: integer("id").primaryKey({ autoIncrement: true }),
  slug: text("slug").notNull().unique(),
  name: text("name").notNull(),
  email: text("email").notNull(),
  phone: text("phone").notNull().default(""),
  town: text("town").notNull().default(""),
  timeZone: text("time_zone").notNull().default("America/Chicago"),
  consultFeeCents: integer("consult_fee_cents").notNull().default(15000),
  // Required distance from the fire to structures and combustibles; local rules range 10–50 ft.
  setbackFt: real("setback_ft").notNull().default(25),
  labourRateCents: integer("labour_rate_cents").notNull().default(7500),
  overheadPct: real("overhead_pct").notNull().default(15),
  marginPct: real("margin_pct").notNull().default(20),
  priceSpreadPct: real("price_spread_pct").notNull().default(12),
  // Overrides of the estimating engine's factors (waste, base depth, labour minutes…), JSON.
  factorsJson: text("factors_json").notNull().default("{}"),
  createdAt: createdAt(),
});

export const ROLES = ["owner", "estimator", "crew", "homeowner"] as const;
export type Role = (typeof ROLES)[number];
export const STAFF_ROLES = ["owner", "estimator", "crew"] as const satisfies readonly Role[];

export const users = sqliteTable(
  "users",
  {
    id: integer("id").primaryKey({ autoIncrement: true }),
    companyId: integer("company_id")
      .notNull()
      .references(() => companies.id),
    email: text("email").notNull(),
    name: text("name").notNull(),
    role: text("role", { enum: ROLES }).notNull(),
    // Null until the person sets a password from their one-time link.
    passwordHash: text("password_hash"),
    isActive: integer("is_active", { mode: "boolean" }).notNull().default(true),
    createdAt: createdAt(),
  },
  (t) => [
    uniqueIndex("users_email_unique").on(t.email),
    index("users_company_role_idx").on(t.companyId, t.role),
  ],
);

// Server-side sessions: the cookie holds only the id, so sign-out and deactivation end a
// session at once, wherever its cookie still lives.
export const sessions = sqliteTable(
  "sessions",
  {
    id: text("id").primaryKey(),
    userId: integer("user_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    expiresAt: text("expires_at").notNull(),
    createdAt: createdAt(),
  },
  (t) => [index("sessions_user_idx").on(t.userId)],
);

export const CATALOG_KINDS = [
  "wall-unit",
  "cap",
  "steel-ring",
  "firebrick",
  "paver",
  "border-unit",
  "aggregate",
  "adhesive",
  "bedding-sand",
  "joint-sand",
] as const;
export type CatalogKind = (typeof CATALOG_KINDS)[number];

// One table for the whole stock: each kind uses the dimension columns that describe it
// (validated per kind in app/lib/catalog-schema.ts), the others stay null.
export const catalogItems = sqliteTable(
  "catalog_items",
  {
    id: integer("id").primaryKey({ autoIncrement: true }),
    companyId: integer("company_id")
      .notNull()
      .references(() => companies.id),
    kind: text("kind", { enum: CATALOG_KINDS }).notNull(),
    name: text("name").notNull(),
    colourName: text("colour_name").notNull().default(""),
    colourHex: text("colour_hex").notNull().default("#8a8178"),
    faceIn: real("face_in"),
    backIn: real("back_in"),
    depthIn: real("depth_in"),
    heightIn: real("height_in"),
    lengthIn: real("length_in"),
    widthIn: real("width_in"),
    thicknessIn: real("thickness_in"),
    diameterIn: real("diameter_in"),
    priceCents: integer("price_cents").notNull(),
    isActive: integer("is_active", { mode: "boolean" }).notNull().default(true),
    createdAt: createdAt(),
    updatedAt: text("updated_at")
      .notNull()
      .default(sql`(strftime('%Y-%m-%dT%H:%M:%fZ','now'))`),
  },
  (t) => [index("catalog_company_kind_idx").on(t.companyId, t.kind, t.isActive, t.name)],
);

export type Company = typeof companies.$inferSelect;
export type User = typeof users.$inferSelect;
export type CatalogItem = typeof catalogItems.$inferSelect;
