// `prisma generate` never runs the schema engine, but the CLI insists that its binary exists and
// cannot download it here; pointing PRISMA_SCHEMA_ENGINE_BINARY at any existing file satisfies it.
import { execFileSync } from "node:child_process";
import path from "node:path";

const root = path.resolve(import.meta.dirname, "..");
const env = {
  ...process.env,
  PRISMA_SCHEMA_ENGINE_BINARY: process.env.PRISMA_SCHEMA_ENGINE_BINARY ?? process.execPath,
  PRISMA_HIDE_UPDATE_MESSAGE: "1",
  CHECKPOINT_DISABLE: "1",
};
execFileSync(process.execPath, [path.join(root, "node_modules/prisma/build/index.js"), "generate", "--schema", "prisma/schema.prisma"], {
  cwd: root,
  env,
  stdio: "inherit",
});
