// Generates both Prisma clients: lib/generated/prisma from prisma/schema.prisma (SQLite, the
// embedded default) and lib/generated/prisma-pg from prisma/postgres/schema.prisma (a team server).
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
for (const schema of ["prisma/schema.prisma", "prisma/postgres/schema.prisma"]) {
  execFileSync(process.execPath, [path.join(root, "node_modules/prisma/build/index.js"), "generate", "--schema", schema], {
    cwd: root,
    env,
    stdio: "inherit",
  });
}
