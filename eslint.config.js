// ESLint: typescript-eslint's recommended rules, the React hooks rules (the compiler's checks included)
// and the module boundaries that keep server code and the database out of the browser's bundle.
import reactHooks from "eslint-plugin-react-hooks";
import { defineConfig, globalIgnores } from "eslint/config";
import tseslint from "typescript-eslint";

// Imports that must never reach the browser. Patterns are regular expressions on the import's text,
// so they hold for "~/…" and relative paths alike, wherever the module sits in app/.
const DB_SCHEMA = {
  regex: "(^|/)db/schema(\\.ts)?$",
  message: "The table definitions (and the ORM) would ship to the browser: import the vocabularies from ~/db/enums.",
};
const DB_CLIENT = {
  regex: "(^|/)db\\.server(\\.ts)?$",
  message: "Route modules do not query the database: call a function of a *.server.ts module instead.",
};
const SERVER_MODULE = {
  regex: "(\\.server(\\.tsx?)?$)|(/\\.server/)",
  message: "Client code cannot import server code (*.server modules hold secrets and database access).",
};

// Checked by tests/unit/lint-boundaries.test.ts through ESLint's Node API.
const boundaries = {
  client: ["error", { patterns: [DB_SCHEMA, SERVER_MODULE] }],
  route: ["error", { patterns: [DB_SCHEMA, DB_CLIENT] }],
};

export default defineConfig([
  globalIgnores([
    "build/",
    "data/",
    "drizzle/",
    "reports/",
    ".react-router/",
    "test-results/",
    "playwright-report/",
    ".stryker-tmp/",
    "public/",
  ]),
  tseslint.configs.recommended,
  {
    files: ["**/*.{ts,tsx,js,mjs}"],
    rules: {
      // A leading underscore marks an argument kept for its position (callbacks, framework signatures).
      // Prettier keeps code within 120 columns; this holds comments to it too (strings may run on).
      "max-len": [
        "error",
        { code: 120, ignoreStrings: true, ignoreTemplateLiterals: true, ignoreUrls: true, ignoreRegExpLiterals: true },
      ],
      "@typescript-eslint/no-unused-vars": [
        "error",
        { argsIgnorePattern: "^_", varsIgnorePattern: "^_", caughtErrors: "none", ignoreRestSiblings: true },
      ],
    },
  },
  {
    files: ["app/**/*.{ts,tsx}", "tests/**/*.{ts,tsx}"],
    ...reactHooks.configs.flat.recommended,
  },
  {
    // Client code: whatever the browser may load.
    files: [
      "app/components/**/*.{ts,tsx}",
      "app/scene/**/*.{ts,tsx}",
      "app/domain/**/*.{ts,tsx}",
      "app/emails/**/*.{ts,tsx}",
      "app/lib/**/*.{ts,tsx}",
    ],
    ignores: ["app/lib/**/*.server.{ts,tsx}", "app/lib/**/.server/**"],
    rules: { "no-restricted-imports": boundaries.client },
  },
  {
    // Route modules may import *.server modules (the framework strips them from the client build with
    // the loaders and actions) but not the tables or the database client.
    files: ["app/routes/**/*.{ts,tsx}", "app/root.tsx"],
    rules: { "no-restricted-imports": boundaries.route },
  },
]);
