import path from "node:path";
import { defineConfig } from "vitest/config";

export default defineConfig({
  resolve: {
    tsconfigPaths: true,
    // Data modules start with `import "server-only"`; outside Next's bundler it is a no-op.
    alias: { "server-only": path.resolve(import.meta.dirname, "tests/fixtures/empty-module.ts") },
  },
  test: {
    environment: "node",
    projects: [
      {
        extends: true,
        test: { name: "unit", include: ["tests/unit/**/*.test.ts"] },
      },
      {
        extends: true,
        test: {
          name: "integration",
          include: ["tests/integration/**/*.test.ts"],
          setupFiles: ["tests/integration/setup.ts"],
          testTimeout: 20_000,
          // Seeding the demo (a year of readings and the first assessment) takes a few seconds, more on a busy machine.
          hookTimeout: 60_000,
        },
      },
    ],
  },
});
