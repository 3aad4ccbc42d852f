import { defineConfig } from "vitest/config";
import path from "node:path";

export default defineConfig({
  resolve: { alias: { "@": path.resolve(import.meta.dirname) } },
  test: {
    environment: "node",
    include: ["tests/**/*.test.ts"],
    setupFiles: ["tests/setup.ts"],
    testTimeout: 30_000,
    hookTimeout: 120_000,
    // Integration and browser files share the test databases and one running app, and some check that
    // a table is unchanged around their requests; one file at a time keeps them independent of how
    // many cores the machine has (on the 2-core CI machine this was already the default).
    fileParallelism: false,
  },
});
