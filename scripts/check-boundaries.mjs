// Lint for the project's module boundaries, which the type checker cannot see:
// the domain stays pure, three.js stays in app/scene, and client code never imports *.server files.
import { readdirSync, readFileSync, statSync } from "node:fs";
import path from "node:path";

const ROOT = path.resolve(import.meta.dirname, "..", "app");
const problems = [];

function walk(dir) {
  for (const name of readdirSync(dir)) {
    const full = path.join(dir, name);
    if (statSync(full).isDirectory()) walk(full);
    else if (/\.(ts|tsx)$/.test(name)) check(full);
  }
}

const importsOf = (source) =>
  [...source.matchAll(/(?:import|export)[^"']*?from\s*["']([^"']+)["']|import\(\s*["']([^"']+)["']\s*\)/g)].map(
    (m) => m[1] ?? m[2],
  );

function check(file) {
  const rel = path.relative(ROOT, file);
  const source = readFileSync(file, "utf8");
  const imports = importsOf(source);
  if (rel.startsWith("domain/")) {
    for (const spec of imports) {
      if (
        /^(react|react-dom|react-router|drizzle-orm|three|@react-three|zod|node:|fs|path)/.test(spec) ||
        spec.includes(".server")
      ) {
        problems.push(`${rel}: the domain must stay pure, but imports "${spec}"`);
      }
    }
    if (/Date\.now\(|new Date\(|process\.env/.test(source))
      problems.push(`${rel}: the domain must not read the clock or the environment`);
  }
  if (!rel.startsWith("scene/")) {
    for (const spec of imports) {
      if (/^(three|@react-three)/.test(spec))
        problems.push(`${rel}: three.js belongs in app/scene (loaded lazily), not here ("${spec}")`);
    }
  }
  if (rel.startsWith("components/") || rel.startsWith("scene/")) {
    for (const spec of imports)
      if (spec.includes(".server")) problems.push(`${rel}: a client component imports server code ("${spec}")`);
  }
}

walk(ROOT);
if (problems.length) {
  console.error(problems.join("\n"));
  process.exit(1);
}
console.log("Module boundaries hold.");
