// Keeps prisma/postgres/schema.prisma (a team server) in step with prisma/schema.prisma (the
// embedded SQLite default): the same models, the same fields with the same types, optionality,
// defaults, ids, unique keys and relations, and the same indexes — only the datasource and the
// generated client's folder may differ.
import { readdirSync, readFileSync } from "node:fs";
import path from "node:path";
import { describe, expect, test } from "vitest";
import { parsePrismaSchema, type SchemaModel } from "../support/prisma-schema";

const read = (rel: string) => readFileSync(path.resolve(import.meta.dirname, "../..", rel), "utf8");
const sqliteText = read("prisma/schema.prisma");
const postgresText = read("prisma/postgres/schema.prisma");
const sqliteModels = parsePrismaSchema(sqliteText);
const postgresModels = parsePrismaSchema(postgresText);
const byName = (models: SchemaModel[], name: string) => models.find((m) => m.name === name);

/** A model's lines without comments and with whitespace collapsed: every attribute, in order. */
function modelLines(text: string, name: string): string[] {
  const block = new RegExp(`^model\\s+${name}\\s*\\{([\\s\\S]*?)^\\}`, "m").exec(text);
  if (!block) return [];
  return block[1]!
    .split("\n")
    .map((l) => l.replace(/\/\/.*$/, "").replace(/\s+/g, " ").trim())
    .filter(Boolean);
}

describe("prisma/postgres/schema.prisma matches prisma/schema.prisma", () => {
  test("the datasources name the two engines, and the clients go to two folders", () => {
    expect(/datasource db \{\s*provider = "sqlite"/.test(sqliteText)).toBe(true);
    expect(/datasource db \{\s*provider = "postgresql"/.test(postgresText)).toBe(true);
    expect(/output\s*=\s*"\.\.\/lib\/generated\/prisma"/.test(sqliteText)).toBe(true);
    expect(/output\s*=\s*"\.\.\/\.\.\/lib\/generated\/prisma-pg"/.test(postgresText)).toBe(true);
  });

  test("the same models", () => {
    expect(sqliteModels.length).toBeGreaterThanOrEqual(10);
    expect(postgresModels.map((m) => m.name).sort()).toEqual(sqliteModels.map((m) => m.name).sort());
  });

  test.each(sqliteModels.map((m) => [m.name, m] as const))("%s: the same fields, types and attributes", (name, model) => {
    const twin = byName(postgresModels, name);
    expect(twin, `model ${name} is missing from prisma/postgres/schema.prisma`).toBeDefined();
    const shape = (m: SchemaModel) => m.fields.map((f) => ({ ...f })).sort((a, b) => a.name.localeCompare(b.name));
    expect(shape(twin!)).toEqual(shape(model));
  });

  test.each(sqliteModels.map((m) => [m.name, m] as const))("%s: the same indexes", (name, model) => {
    const key = (m: SchemaModel) => m.indexes.map((i) => `${i.unique ? "unique" : "index"}(${i.columns.join(",")})`).sort();
    expect(key(byName(postgresModels, name)!)).toEqual(key(model));
  });

  test.each(sqliteModels.map((m) => [m.name] as const))("%s: line for line the same (attributes the reader does not model, such as @updatedAt, included)", (name) => {
    expect(modelLines(postgresText, name)).toEqual(modelLines(sqliteText, name));
  });
});

describe("prisma/postgres/migrations keeps in step with prisma/migrations", () => {
  test("every SQLite migration has a PostgreSQL twin of the same name, and no other", () => {
    const names = (dir: string) => readdirSync(path.resolve(import.meta.dirname, "../..", dir), { withFileTypes: true }).filter((e) => e.isDirectory()).map((e) => e.name).sort();
    const sqliteNames = names("prisma/migrations");
    expect(sqliteNames.length).toBeGreaterThan(0);
    expect(names("prisma/postgres/migrations")).toEqual(sqliteNames);
  });
});
