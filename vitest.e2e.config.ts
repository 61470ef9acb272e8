import { defineConfig } from "vitest/config";
import path from "node:path";

export default defineConfig({
  resolve: { alias: { "@": path.resolve(import.meta.dirname) } },
  test: {
    include: ["test/e2e/**/*.test.ts"],
    environment: "node",
    testTimeout: 180_000,
    hookTimeout: 600_000,
    fileParallelism: false,
  },
});
