/**
 * A small reader of prisma/schema.prisma for the drift test: models, scalar fields (type,
 * optional, default, id, unique), relations with their foreign keys, and block indexes.
 * It covers the subset of the schema language this project uses and fails loudly on the rest.
 */
export interface SchemaField {
  name: string;
  type: string;
  optional: boolean;
  list: boolean;
  isId: boolean;
  isUnique: boolean;
  autoincrement: boolean;
  defaultValue: string | null;
  relation: { fields: string[]; references: string[] } | null;
}

export interface SchemaModel {
  name: string;
  fields: SchemaField[];
  indexes: { columns: string[]; unique: boolean }[];
}

const SCALARS = new Set(["String", "Int", "Float", "Boolean", "DateTime", "BigInt", "Decimal", "Json", "Bytes"]);

function listArg(text: string, key: string): string[] {
  const m = new RegExp(`${key}\\s*:\\s*\\[([^\\]]*)\\]`).exec(text);
  return m?.[1] ? m[1].split(",").map((s) => s.trim()).filter(Boolean) : [];
}

export function parsePrismaSchema(source: string): SchemaModel[] {
  const models: SchemaModel[] = [];
  const blockRe = /^model\s+(\w+)\s*\{([\s\S]*?)^\}/gm;
  for (const block of source.matchAll(blockRe)) {
    const name = block[1]!;
    const body = block[2]!;
    const model: SchemaModel = { name, fields: [], indexes: [] };
    for (const rawLine of body.split("\n")) {
      const line = rawLine.replace(/\/\/.*$/, "").trim();
      if (!line) continue;
      if (line.startsWith("@@")) {
        const m = /^@@(index|unique)\(\s*\[([^\]]*)\]/.exec(line);
        if (!m) throw new Error(`parsePrismaSchema: unsupported block attribute in ${name}: ${line}`);
        model.indexes.push({ unique: m[1] === "unique", columns: m[2]!.split(",").map((s) => s.trim()) });
        continue;
      }
      const m = /^(\w+)\s+(\w+)(\[\])?(\?)?\s*(.*)$/.exec(line);
      if (!m) throw new Error(`parsePrismaSchema: cannot read field line in ${name}: ${line}`);
      const attrs = m[5] ?? "";
      const rel = /@relation\(([^)]*)\)/.exec(attrs);
      const relFields = rel ? listArg(rel[1]!, "fields") : [];
      const def = /@default\(((?:[^()]|\([^()]*\))*)\)/.exec(attrs);
      model.fields.push({
        name: m[1]!,
        type: m[2]!,
        list: Boolean(m[3]),
        optional: Boolean(m[4]),
        isId: /@id\b/.test(attrs),
        isUnique: /@unique\b/.test(attrs),
        autoincrement: /@default\(autoincrement\(\)\)/.test(attrs),
        defaultValue: def ? def[1]! : null,
        relation: relFields.length ? { fields: relFields, references: listArg(rel![1]!, "references") } : null,
      });
    }
    models.push(model);
  }
  return models;
}

/** Scalar (column) fields of a model: relation fields and back-relations are left out. */
export function columnsOf(model: SchemaModel): SchemaField[] {
  return model.fields.filter((f) => SCALARS.has(f.type) && !f.list);
}

/** The SQLite column type Prisma uses for each scalar type. */
export const SQLITE_TYPE: Record<string, string> = {
  String: "TEXT",
  Int: "INTEGER",
  Float: "REAL",
  Boolean: "BOOLEAN",
  DateTime: "DATETIME",
  BigInt: "BIGINT",
  Decimal: "DECIMAL",
  Json: "JSONB",
  Bytes: "BLOB",
};

/** The PostgreSQL column type (information_schema.columns.data_type) Prisma uses for each scalar type. */
export const POSTGRES_TYPE: Record<string, string> = {
  String: "text",
  Int: "integer",
  Float: "double precision",
  Boolean: "boolean",
  DateTime: "timestamp without time zone",
  BigInt: "bigint",
  Decimal: "numeric",
  Json: "jsonb",
  Bytes: "bytea",
};
