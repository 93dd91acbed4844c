// The lint rule that keeps the tables, the database client and server modules out of the browser's
// bundle, run through ESLint's Node API on snippets placed where each kind of module lives.
import path from "node:path";
import { ESLint } from "eslint";
import { describe, expect, test } from "vitest";

const eslint = new ESLint({ cwd: path.resolve(import.meta.dirname, "../..") });

/** The boundary messages ESLint gives `code` as if it were the file at `filePath`. */
async function boundaryProblems(filePath: string, code: string): Promise<string[]> {
  const [result] = await eslint.lintText(code, { filePath });
  return result!.messages.filter((m) => m.ruleId === "no-restricted-imports").map((m) => m.message);
}

describe("client code (components, scene, domain, e-mails, non-server library modules)", () => {
  const clientFiles = [
    "app/components/some-card.tsx",
    "app/components/configurator/some-control.tsx",
    "app/scene/some-mesh.tsx",
    "app/domain/some-rule.ts",
    "app/emails/some-mail.tsx",
    "app/lib/some-format.ts",
    "app/lib/leads/some-schema.ts",
  ];

  test.each(clientFiles)("%s may not import the table definitions", async (file) => {
    const problems = await boundaryProblems(file, 'import { leads } from "~/db/schema";\nexport const t = leads;\n');
    expect(problems).toHaveLength(1);
    expect(problems[0]).toMatch(/table definitions/);
  });

  test.each(clientFiles)("%s may not import the database client or any server module", async (file) => {
    const code = [
      'import { db } from "~/lib/platform/db.server";',
      'import { requireUser } from "~/lib/session.server";',
      'import { findLead } from "../lib/leads/queries.server";',
      'export { sendMail } from "./mail.server.ts";',
      'import { secret } from "~/lib/.server/secret";',
      "export const all = [db, requireUser, findLead, secret];",
    ].join("\n");
    const problems = await boundaryProblems(file, code);
    expect(problems).toHaveLength(5);
    for (const message of problems) expect(message).toMatch(/server code/);
  });

  test("relative paths to the schema are caught too, and type-only imports as well", async () => {
    const problems = await boundaryProblems(
      "app/components/workspace/some-menu.tsx",
      'import type { Lead } from "../../db/schema";\nexport type L = Lead;\n',
    );
    expect(problems).toHaveLength(1);
  });

  test("the vocabularies (~/db/enums) and client-safe library modules stay allowed", async () => {
    const code =
      'import { ROLES } from "~/db/enums";\nimport { formatMoney } from "~/lib/money";\nexport const x = [ROLES, formatMoney];\n';
    expect(await boundaryProblems("app/components/some-card.tsx", code)).toEqual([]);
    // A name that merely contains "server" is not a server module.
    const lookalike = 'import { serverTiming } from "~/lib/server-timing";\nexport const y = serverTiming;\n';
    expect(await boundaryProblems("app/components/some-card.tsx", lookalike)).toEqual([]);
  });
});

describe("server modules", () => {
  test("a *.server module may use the tables and the database client", async () => {
    const code =
      'import { leads } from "~/db/schema";\nimport { db } from "~/lib/platform/db.server";\nexport const q = () => db.select().from(leads);\n';
    expect(await boundaryProblems("app/lib/some-queries.server.ts", code)).toEqual([]);
    expect(await boundaryProblems("app/lib/leads/some-queries.server.ts", code)).toEqual([]);
  });
});

describe("route modules", () => {
  test("may import server modules (the build strips them with the loaders and actions)", async () => {
    const code = 'import { requireUser } from "~/lib/session.server";\nexport const loader = requireUser;\n';
    expect(await boundaryProblems("app/routes/some-page.tsx", code)).toEqual([]);
    expect(await boundaryProblems("app/root.tsx", code)).toEqual([]);
  });

  test.each(["app/routes/some-page.tsx", "app/routes/api/some-endpoint.ts", "app/root.tsx"])(
    "%s may not import the tables or the database client",
    async (file) => {
      const code =
        'import { leads } from "~/db/schema";\nimport { db } from "~/lib/platform/db.server";\nexport const q = [leads, db];\n';
      const problems = await boundaryProblems(file, code);
      expect(problems).toHaveLength(2);
      expect(problems[0]).toMatch(/table definitions/);
      expect(problems[1]).toMatch(/do not query the database/);
    },
  );
});
