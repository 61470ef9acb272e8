import { readFileSync } from "node:fs";
import path from "node:path";
import { describe, expect, test } from "vitest";
import { parsePrismaSchema } from "../../test/support/prisma-schema";
import { COPY_ORDER } from "./copy-to-postgres";

const models = parsePrismaSchema(readFileSync(path.resolve(import.meta.dirname, "../../prisma/schema.prisma"), "utf8"));

describe("COPY_ORDER", () => {
  test("names every model of the schema once", () => {
    expect([...COPY_ORDER].sort()).toEqual(models.map((m) => m.name).sort());
    expect(new Set(COPY_ORDER).size).toBe(COPY_ORDER.length);
  });

  test.each(models.flatMap((m) => m.fields.filter((f) => f.relation).map((f) => [m.name, f.name, f.type] as const)))("%s.%s: its parent %s is copied first", (child, _field, parent) => {
    const order = COPY_ORDER as readonly string[];
    expect(order.indexOf(parent)).toBeLessThan(order.indexOf(child));
  });
});
