import { defineConfig } from "vitest/config";
import base from "./vitest.config";

/**
 * `npm run test:server`: the data-layer, import, job and statistics tests again, each test
 * file against a libSQL server (sqld) of its own on loopback instead of a file, plus the
 * multi-node tests in tests/server (primary + replica, embedded replica, two workers, two web
 * nodes). tests/server/global-setup.ts fetches sqld once.
 */
export default defineConfig({
  ...base,
  test: {
    ...base.test,
    include: [
      "tests/unit/db/**/*.test.ts",
      "tests/unit/jobs/**/*.test.ts",
      "tests/unit/recompute/**/*.test.ts",
      "tests/unit/seed/**/*.test.ts",
      "tests/unit/cli/**/*.test.ts",
      "tests/server/**/*.test.ts",
    ],
    globalSetup: ["tests/server/global-setup.ts"],
    env: { RECURRA_TEST_DATABASE: "server" },
    testTimeout: 60_000,
    hookTimeout: 180_000,
  },
});
