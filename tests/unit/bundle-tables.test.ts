// The bundle check's guard against the data model reaching the browser: a client chunk that carries
// table definitions fails the check. The chunks here are synthetic: one bundled and minified by Vite
// (the project's own bundler) from a module that imports the schema, one from a module that imports
// only the vocabularies, and hand-written ones.
import { mkdir, mkdtemp, rm, writeFile } from "node:fs/promises";
import { tmpdir } from "node:os";
import path from "node:path";
import { build, type Rolldown } from "vite";
import { afterAll, beforeAll, describe, expect, test } from "vitest";
import { checkBundles, findTableChunks, findTableDefinitions, schemaTableSignatures } from "../bench/bundle-budget";

const ROOT = path.resolve(import.meta.dirname, "../..");
let work: string;

beforeAll(async () => {
  work = await mkdtemp(path.join(tmpdir(), "emberwright-bundle-"));
});
afterAll(async () => {
  await rm(work, { recursive: true, force: true });
});

/** Bundles and minifies a module that imports `names` from `app/<module>.ts`, as the client build would. */
async function bundleForBrowser(module: string, names: string[]): Promise<string> {
  const entry = path.join(work, `probe-${module.replaceAll("/", "-")}.ts`);
  const target = path.join(ROOT, "app", `${module}.ts`);
  await writeFile(
    entry,
    `import { ${names.join(", ")} } from ${JSON.stringify(target)};\nconsole.log(${names.join(", ")});\n`,
  );
  const output = (await build({
    configFile: false,
    logLevel: "silent",
    root: ROOT,
    resolve: { tsconfigPaths: true },
    build: { write: false, minify: true, lib: { entry, formats: ["es"], fileName: "chunk" } },
  })) as Rolldown.RolldownOutput[];
  return output
    .flatMap((o) => o.output)
    .flatMap((chunk) => (chunk.type === "chunk" ? [chunk.code] : []))
    .join("\n");
}

describe("finding table definitions in a chunk", () => {
  const signatures = schemaTableSignatures();

  test("the schema's tables are all known, with their SQL column names", () => {
    const leads = signatures.find((s) => s.table === "leads");
    expect(leads?.columns).toContain("company_id");
    expect(signatures.map((s) => s.table)).toEqual(
      expect.arrayContaining(["companies", "users", "bookings", "proposals"]),
    );
  });

  test("a minified chunk built from a module that imports the schema is caught", async () => {
    const code = await bundleForBrowser("db/schema", ["BOOKING_STATUSES", "leads"]);
    const found = findTableDefinitions(code, signatures);
    expect(found.hasTableBuilder).toBe(true);
    // The whole schema module comes along, so every table does.
    expect(found.tables).toEqual(expect.arrayContaining(["leads", "companies", "bookings", "email_outbox"]));
  }, 60_000);

  test("a chunk built from a module that imports only the vocabularies is clean", async () => {
    const code = await bundleForBrowser("db/enums", ["ROLES", "LEAD_STATUSES"]);
    expect(code).toContain("estimator");
    expect(findTableDefinitions(code, signatures)).toEqual({ tables: [], hasTableBuilder: false });
  }, 60_000);

  test("a table's name with its column names is enough, whatever the builder was renamed to", () => {
    const chunk =
      'const r=q("lead_revisions",{id:n("id").primaryKey(),leadId:n("lead_id"),designJson:t("design_json")});export{r};';
    expect(findTableDefinitions(chunk, signatures)).toEqual({ tables: ["lead_revisions"], hasTableBuilder: false });
  });

  test("ordinary words that happen to be table or column names are not", () => {
    // "leads" and "users" as words, and one snake_case column name on its own.
    const chunk = 'const a={title:"leads",b:"users",c:"Read the leads",d:"company_id"};export{a};';
    expect(findTableDefinitions(chunk, signatures)).toEqual({ tables: [], hasTableBuilder: false });
  });
});

describe("the bundle check", () => {
  /** A client build with one page route whose code is `routeCode`. */
  async function syntheticBuild(name: string, routeCode: string): Promise<string> {
    const buildDir = path.join(work, name);
    const assets = path.join(buildDir, "client", "assets");
    await mkdir(assets, { recursive: true });
    const manifest = {
      entry: { module: "/assets/entry.client-a1.js", imports: [] },
      url: "/assets/manifest-a1.js",
      routes: {
        root: { id: "root", module: "/assets/root-a1.js" },
        "routes/app-team": {
          id: "routes/app-team",
          parentId: "root",
          path: "app/team",
          module: "/assets/app-team-a1.js",
        },
      },
    };
    await writeFile(path.join(assets, "manifest-a1.js"), `window.__reactRouterManifest=${JSON.stringify(manifest)};`);
    await writeFile(path.join(assets, "entry.client-a1.js"), "export const e=1;");
    await writeFile(path.join(assets, "root-a1.js"), "export const r=1;");
    await writeFile(path.join(assets, "app-team-a1.js"), routeCode);
    return buildDir;
  }

  test("fails when a client chunk carries table definitions, naming the chunk and the tables", async () => {
    const code = 'const u=s("users",{id:i("id"),companyId:i("company_id"),passwordHash:t("password_hash")});export{u};';
    const buildDir = await syntheticBuild("with-tables", code);
    const report = await checkBundles(buildDir);
    expect(report.tableChunks).toEqual([
      { file: path.join("assets", "app-team-a1.js"), tables: ["users"], hasTableBuilder: false },
    ]);
    expect(report.breaches).toEqual([`${path.join("assets", "app-team-a1.js")} carries table definitions (users)`]);
  });

  test("passes the same build without them", async () => {
    const buildDir = await syntheticBuild("clean", 'const roles=["owner","estimator","crew"];export{roles};');
    const report = await checkBundles(buildDir);
    expect(report.tableChunks).toEqual([]);
    expect(report.breaches).toEqual([]);
  });

  test("looks at every client file, not only the ones a page loads first", async () => {
    const buildDir = await syntheticBuild("lazy-chunk", "export const p=1;");
    await writeFile(
      path.join(buildDir, "client", "assets", "lazy-b2.js"),
      'class T{static[k]="SQLiteTable"}export{T};',
    );
    expect(await findTableChunks(path.join(buildDir, "client"))).toEqual([
      { file: path.join("assets", "lazy-b2.js"), tables: [], hasTableBuilder: true },
    ]);
  });
});
