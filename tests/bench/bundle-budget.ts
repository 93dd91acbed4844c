/*
 * JavaScript budget of the production build: for every page route, the gzipped size of the JS a
 * first visit loads before hydration (the route manifest, entry.client, and the module and static
 * imports of root, each layout and the route itself). Fails when a route ships three.js in that
 * initial JS, when a route that shows no 3D goes over 150 kB gzipped, or when any client chunk
 * carries table definitions (the ORM's table builder, or a table's name with its column names):
 * the browser must never download the data model.
 * Run after `npm run build`: npx tsx tests/bench/bundle-budget.ts  (exit 1 on a breach)
 */
import { readdir, readFile } from "node:fs/promises";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { runInNewContext } from "node:vm";
import { gzipSync } from "node:zlib";
import { is } from "drizzle-orm";
import { getTableConfig, SQLiteTable } from "drizzle-orm/sqlite-core";
import * as schema from "../../app/db/schema";

/** kB here are 1000 bytes, as Vite prints them. */
export const NON_3D_ROUTE_BUDGET_KB = 150;

type ManifestEntry = { module: string; imports?: string[] };
type ManifestRoute = ManifestEntry & { id: string; parentId?: string; path?: string; index?: boolean };
type ClientManifest = { entry: ManifestEntry; routes: Record<string, ManifestRoute>; url: string };

export type RouteBudget = {
  id: string;
  url: string;
  initialKb: number;
  files: string[];
  /** Initial files that carry three.js (should be none). */
  threeFiles: string[];
  /** The route can load the 3D preview lazily. */
  shows3d: boolean;
  /** Gzipped size of the lazily loaded 3D code not already in the initial JS. */
  lazy3dKb: number;
  lazy3dFiles: string[];
  breach: string | null;
};

export type BundleReport = { routes: RouteBudget[]; skipped: string[]; tableChunks: TableChunk[]; breaches: string[] };

/** A client chunk that carries table definitions, and what gave it away. */
export type TableChunk = { file: string; tables: string[]; hasTableBuilder: boolean };

/** A table as SQL names it: what survives minification of its definition (string literals). */
export type TableSignature = { table: string; columns: string[] };

/** Every table of app/db/schema.ts with its column names. */
export function schemaTableSignatures(): TableSignature[] {
  return Object.values(schema)
    .filter((value) => is(value, SQLiteTable))
    .map((table) => {
      const config = getTableConfig(table);
      return { table: config.name, columns: config.columns.map((column) => column.name) };
    });
}

// The entity kinds drizzle's SQLite table and column classes carry as plain strings.
const TABLE_BUILDER_SIGNATURE = /["'`]SQLite(Table|Column|ColumnBuilder)["'`]/;
// A table counts as defined in a chunk when its name and this many of its column names (those with
// an underscore, so an ordinary word such as "name" or "email" is never the evidence) are quoted there.
const COLUMNS_FOR_A_TABLE = 2;

/** The tables whose definitions `text` (one chunk) carries, and whether it holds the table builder. */
export function findTableDefinitions(text: string, signatures: TableSignature[]): Omit<TableChunk, "file"> {
  const quoted = new Set([...text.matchAll(/["'`]([a-z][a-z0-9_]*)["'`]/g)].map((m) => m[1]!));
  const tables = signatures
    .filter(({ table, columns }) => {
      const telling = columns.filter((c) => c.includes("_"));
      const needed = Math.min(COLUMNS_FOR_A_TABLE, telling.length);
      return quoted.has(table) && needed > 0 && telling.filter((c) => quoted.has(c)).length >= needed;
    })
    .map((s) => s.table);
  return { tables, hasTableBuilder: TABLE_BUILDER_SIGNATURE.test(text) };
}

/** Every .js file under `clientDir` (the client build) that carries table definitions. */
export async function findTableChunks(clientDir: string, signatures = schemaTableSignatures()): Promise<TableChunk[]> {
  const found: TableChunk[] = [];
  for (const entry of await readdir(clientDir, { recursive: true, withFileTypes: true })) {
    if (!entry.isFile() || !/\.m?js$/.test(entry.name)) continue;
    const full = path.join(entry.parentPath, entry.name);
    const hit = findTableDefinitions(await readFile(full, "utf8"), signatures);
    if (hit.tables.length || hit.hasTableBuilder) found.push({ file: path.relative(clientDir, full), ...hit });
  }
  return found.sort((a, b) => a.file.localeCompare(b.file));
}

// Strings that only three.js's renderer carries, so a renamed or merged chunk is still caught.
const THREE_SIGNATURE = /WebGLRenderer|WebGLRenderTarget/;
const STATIC_IMPORT = /(?:\bfrom\s*|\bimport\s*)["'`](\.{1,2}\/[^"'`]+\.js)["'`]/g;
const DYNAMIC_IMPORT = /\bimport\(\s*["'`](\.{1,2}\/[^"'`]+\.js)["'`]\s*\)/g;

/** Measures every page route of the client build under `buildDir` (the folder holding client/). */
export async function checkBundles(buildDir: string): Promise<BundleReport> {
  const clientDir = path.join(buildDir, "client");
  const assetsDir = path.join(clientDir, "assets");
  const manifestFile = (await readdir(assetsDir)).find((f) => /^manifest-[\w-]+\.js$/.test(f));
  if (!manifestFile) throw new Error(`No route manifest (manifest-*.js) in ${assetsDir}: run \`npm run build\` first.`);
  const sandbox: { window: { __reactRouterManifest?: ClientManifest } } = { window: {} };
  runInNewContext(await readFile(path.join(assetsDir, manifestFile), "utf8"), sandbox);
  const manifest = sandbox.window.__reactRouterManifest;
  if (!manifest) throw new Error(`${manifestFile} did not define the route manifest.`);

  const cache = new Map<string, { text: string; gzipBytes: number }>();
  const file = async (urlPath: string) => {
    let hit = cache.get(urlPath);
    if (!hit) {
      const text = await readFile(path.join(clientDir, urlPath), "utf8");
      // Level 6 is zlib's default, which the compression middleware of react-router-serve uses.
      hit = { text, gzipBytes: gzipSync(text, { level: 6 }).length };
      cache.set(urlPath, hit);
    }
    return hit;
  };
  const importsOf = async (urlPath: string, pattern: RegExp) =>
    [...(await file(urlPath)).text.matchAll(pattern)].map((m) => path.posix.join(path.posix.dirname(urlPath), m[1]!));
  const staticClosure = async (roots: string[]) => {
    const seen = new Set<string>();
    const queue = [...roots];
    while (queue.length) {
      const next = queue.pop()!;
      if (seen.has(next)) continue;
      seen.add(next);
      queue.push(...(await importsOf(next, STATIC_IMPORT)));
    }
    return seen;
  };
  const carriesThree = async (urlPath: string) =>
    /three/i.test(path.posix.basename(urlPath)) || THREE_SIGNATURE.test((await file(urlPath)).text);
  const gzipKb = async (files: Iterable<string>) => {
    let bytes = 0;
    for (const f of files) bytes += (await file(f)).gzipBytes;
    return bytes / 1000;
  };

  const routes: RouteBudget[] = [];
  const skipped: string[] = [];
  for (const route of Object.values(manifest.routes)) {
    if (route.id === "root") continue;
    // Resource routes and redirect-only routes have an empty client module: nothing to hydrate.
    if ((await file(route.module)).text.trim() === "") {
      skipped.push(route.id);
      continue;
    }
    const chain: ManifestRoute[] = [];
    for (let r: ManifestRoute | undefined = route; r; r = r.parentId ? manifest.routes[r.parentId] : undefined)
      chain.unshift(r);
    const roots = [
      manifest.url,
      manifest.entry.module,
      ...(manifest.entry.imports ?? []),
      ...chain.flatMap((r) => [r.module, ...(r.imports ?? [])]),
    ];
    const initial = await staticClosure(roots);
    const threeFiles: string[] = [];
    for (const f of initial) if (await carriesThree(f)) threeFiles.push(f);

    const lazy = new Set<string>();
    for (const f of initial) {
      for (const target of await importsOf(f, DYNAMIC_IMPORT)) {
        const closure = await staticClosure([target]);
        let hasThree = false;
        for (const c of closure) if (await carriesThree(c)) hasThree = true;
        if (hasThree) for (const c of closure) if (!initial.has(c)) lazy.add(c);
      }
    }
    const shows3d = lazy.size > 0 || threeFiles.length > 0;
    const initialKb = await gzipKb(initial);
    const breach = threeFiles.length
      ? `${route.id} ships three.js before hydration (${threeFiles.map((f) => path.posix.basename(f)).join(", ")})`
      : !shows3d && initialKb > NON_3D_ROUTE_BUDGET_KB
        ? `${route.id} loads ${initialKb.toFixed(1)} kB gzipped of JS, over the ${NON_3D_ROUTE_BUDGET_KB} kB budget`
        : null;
    routes.push({
      id: route.id,
      url: routeUrl(route, manifest),
      initialKb,
      files: [...initial].map((f) => path.posix.basename(f)).sort(),
      threeFiles,
      shows3d,
      lazy3dKb: await gzipKb(lazy),
      lazy3dFiles: [...lazy].map((f) => path.posix.basename(f)).sort(),
      breach,
    });
  }
  routes.sort((a, b) => b.initialKb - a.initialKb);
  const tableChunks = await findTableChunks(clientDir);
  const breaches = [
    ...routes.flatMap((r) => (r.breach ? [r.breach] : [])),
    ...tableChunks.map(
      (c) =>
        `${c.file} carries table definitions (${[...(c.hasTableBuilder ? ["the ORM's table builder"] : []), ...c.tables].join(", ")})`,
    ),
  ];
  return { routes, skipped, tableChunks, breaches };
}

function routeUrl(route: ManifestRoute, manifest: ClientManifest): string {
  const parts: string[] = [];
  for (let r: ManifestRoute | undefined = route; r; r = r.parentId ? manifest.routes[r.parentId] : undefined) {
    if (r.path) parts.unshift(r.path);
  }
  return `/${parts.join("/")}`.replace(/\/+/g, "/");
}

async function main() {
  const buildDir = path.resolve(fileURLToPath(new URL("../../build", import.meta.url)));
  const report = await checkBundles(buildDir);
  console.log(`Initial JS per page route, gzipped (budget ${NON_3D_ROUTE_BUDGET_KB} kB for routes without 3D):`);
  for (const r of report.routes) {
    const lazy = r.shows3d ? `, 3D loaded later: ${r.lazy3dKb.toFixed(1)} kB (${r.lazy3dFiles.join(", ")})` : "";
    console.log(`  ${r.breach ? "FAIL" : "ok  "} ${r.initialKb.toFixed(1).padStart(6)} kB  ${r.url} (${r.id})${lazy}`);
  }
  if (report.skipped.length) console.log(`  (no client code: ${report.skipped.join(", ")})`);
  console.log(
    report.tableChunks.length
      ? `Client chunks with table definitions: ${report.tableChunks.length}`
      : "No client chunk carries table definitions.",
  );
  if (report.breaches.length) {
    console.error(`\nOver budget:\n  ${report.breaches.join("\n  ")}`);
    process.exit(1);
  }
}

if (process.argv[1] && path.resolve(process.argv[1]) === fileURLToPath(import.meta.url)) await main();
