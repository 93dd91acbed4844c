/*
 * The baseline for the app's own request cost: a minimal React Router 7 app (a root, one page, a
 * JSON resource route and one that also runs `select 1` on a libSQL file) written into a temp
 * folder, built with the same installed react-router packages and Vite, and served by the same
 * server.mjs as the app. server.mjs reads a few hooks from the app's build (origin, body limits,
 * security headers, request context); a small wrapper module gives the bare build neutral ones,
 * so the server code on both sides is the same and the difference is the app's.
 */
import { mkdir, mkdtemp, readFile, rm, symlink, writeFile } from "node:fs/promises";
import { tmpdir } from "node:os";
import path from "node:path";
import { runToEnd } from "./processes";

export type BareApp = {
  dir: string;
  /** The module to give server.mjs as its build (argument 1). */
  serverEntry: string;
  /** A libSQL file the /api/health-db route opens. */
  databaseFile: string;
  remove: () => Promise<void>;
};

const FILES: Record<string, string> = {
  "react-router.config.ts": `export default { ssr: true };\n`,
  "vite.config.ts": `import { reactRouter } from "@react-router/dev/vite";
import { defineConfig } from "vite";
export default defineConfig({ plugins: [reactRouter()] });
`,
  "app/root.tsx": `import { Links, Meta, Outlet, Scripts, ScrollRestoration } from "react-router";
export function Layout({ children }: { children: React.ReactNode }) {
  return (
    <html lang="en">
      <head><meta charSet="utf-8" /><meta name="viewport" content="width=device-width, initial-scale=1" /><Meta /><Links /></head>
      <body>{children}<ScrollRestoration /><Scripts /></body>
    </html>
  );
}
export default function App() {
  return <Outlet />;
}
`,
  "app/routes.ts": `import { index, route } from "@react-router/dev/routes";
export default [index("routes/home.tsx"), route("api/health", "routes/health.ts"), route("api/health-db", "routes/health-db.ts")];
`,
  "app/routes/home.tsx": `export default function Home() {
  return <main><h1>Bare page</h1></main>;
}
`,
  "app/routes/health.ts": `export function loader() {
  return Response.json({ ok: true }, { headers: { "Cache-Control": "no-store" } });
}
`,
  "app/routes/health-db.ts": `import { createClient } from "@libsql/client";
const client = createClient({ url: "file:" + process.env.BARE_DATABASE_FILE });
export async function loader() {
  await client.execute("select 1");
  return Response.json({ ok: true, db: true }, { headers: { "Cache-Control": "no-store" } });
}
`,
  "build/server/bench-entry.mjs": `import * as build from "./index.js";
export * from "./index.js";
export const entry = {
  ...build.entry,
  module: {
    ...build.entry.module,
    serverHooks: {
      appOrigin: process.env.APP_ORIGIN,
      bodyLimitFor: () => ({ bytes: 1024 * 1024, label: "1 MB" }),
      bodyTooLarge: () => new Response("Too large", { status: 413 }),
      applyBaselineHeaders: () => {},
      createLoadContext: () => undefined,
    },
  },
};
`,
};

/** Writes and builds the bare app; `root` is this project (for node_modules). */
export async function buildBareApp(root: string): Promise<BareApp> {
  const dir = await mkdtemp(path.join(tmpdir(), "emberwright-bare-rr7-"));
  const remove = () => rm(dir, { recursive: true, force: true });
  try {
    await symlink(path.join(root, "node_modules"), path.join(dir, "node_modules"), "dir");
    // The framework picks its server runtime from the dependencies: the same pinned versions as ours.
    const ours = JSON.parse(await readFile(path.join(root, "package.json"), "utf8")) as {
      dependencies: Record<string, string>;
    };
    const dependencies = Object.fromEntries(
      ["react", "react-dom", "react-router", "@react-router/node", "isbot", "@libsql/client"].map((name) => [
        name,
        ours.dependencies[name]!,
      ]),
    );
    await writeFile(
      path.join(dir, "package.json"),
      JSON.stringify({ name: "bare-react-router", private: true, type: "module", dependencies }, null, 2),
    );
    for (const [file, text] of Object.entries(FILES)) {
      if (file.startsWith("build/")) continue;
      await mkdir(path.dirname(path.join(dir, file)), { recursive: true });
      await writeFile(path.join(dir, file), text);
    }
    const build = await runToEnd(path.join(root, "node_modules/.bin/react-router"), ["build"], {
      cwd: dir,
      timeoutMs: 150_000,
    });
    if (build.code !== 0)
      throw new Error(`Building the bare React Router app failed: ${(build.stderr || build.stdout).slice(-3000)}`);
    const serverEntry = path.join(dir, "build/server/bench-entry.mjs");
    await writeFile(serverEntry, FILES["build/server/bench-entry.mjs"]!);
    return { dir, serverEntry, databaseFile: path.join(dir, "bare.db"), remove };
  } catch (error) {
    await remove();
    throw error;
  }
}
