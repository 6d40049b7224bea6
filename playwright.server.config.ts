import { defineConfig } from "@playwright/test";
import base from "./playwright.config";

/**
 * `npm run test:server:e2e`: the browser smoke tests (sign-in, sessions, the pattern explorer)
 * against two `next start` nodes sharing one libSQL server, once per node. Needs a build
 * (`next build`, as `npm test` makes).
 */
export default defineConfig({
  ...base,
  globalSetup: "./tests/server/e2e-setup.ts",
  outputDir: "test-results/e2e-nodes",
  reporter: [["list"]],
  projects: ["node-a", "node-b"].map((name) => ({
    name,
    use: { ...base.use, viewport: { width: 1280, height: 800 } },
    testMatch: /(auth|patterns)\.spec\.ts/,
  })),
});
