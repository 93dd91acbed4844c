// Mutation testing of the estimating engine (`npm run mutate`; never part of `npm test`: it is slow).
// StrykerJS 9 (10 needs Node 22) with the Vitest runner, against tests/unit/domain only.
/** @type {import('@stryker-mutator/api/core').PartialStrykerOptions} */
export default {
  testRunner: "vitest",
  vitest: { configFile: "vitest.domain.config.ts", related: false },
  mutate: ["app/domain/**/*.ts"],
  coverageAnalysis: "perTest",
  reporters: ["clear-text", "progress", "html", "json"],
  htmlReporter: { fileName: "reports/mutation/index.html" },
  jsonReporter: { fileName: "reports/mutation/mutation.json" },
  thresholds: { high: 90, low: 85, break: null },
  // Two shared cores: one worker unless the caller asks for more (npm run mutate -- --concurrency 2).
  concurrency: 1,
  timeoutMS: 20_000,
  tempDirName: ".stryker-tmp",
  ignorePatterns: [
    "data",
    "build",
    "reports",
    ".react-router",
    "test-results",
    "playwright-report",
    "tests/e2e",
    "tests/bench",
  ],
  cleanTempDir: "always",
};
