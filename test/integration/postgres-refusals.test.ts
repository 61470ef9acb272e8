// Values PostgreSQL refuses that SQLite would take (found by fuzz-routes.test.ts): an id beyond
// INTEGER names no row on either engine and is refused alike on both, never as `internal`; text
// with a NUL character is invalid_input naming the field (or the import row) on both; and
// guard() turns PostgreSQL's refusals of out-of-range numbers and untranslatable text into
// `invalid_input`, and a duplicate key on either engine into `conflict`.
import { beforeAll, describe, expect, test } from "vitest";
import { sql } from "@/lib/db/sql";
import { localActor, type Actor } from "@/lib/server/actor";
import { assignSourceDoi } from "@/lib/server/citations";
import { getSourcePapers, listDocuments, openDocument } from "@/lib/server/files";
import { getImportPreset, listImportPresets, saveImportPreset } from "@/lib/server/imports";
import { getRecordPage, updateRecord } from "@/lib/server/records";
import { resolveFlag } from "@/lib/server/review";
import { getSourceQuality } from "@/lib/server/source-quality";
import { getCoverage } from "@/lib/server/coverage";
import { commitImport } from "@/lib/server/imports";
import { createRecord, listRecords } from "@/lib/server/records";
import { createSource, getSourcePage } from "@/lib/server/sources";
import { addUser } from "@/lib/server/users";
import { NUL_MESSAGE } from "@/lib/schemas/plain-input";
import { getSuggestionSetView } from "@/lib/server/suggestions";
import { guard, ok, postgresCodeOf } from "@/lib/server/result";
import { MAX_ROW_ID } from "@/lib/schemas/ids";
import { mixedUnitRecord, sourceInput } from "../support/fixtures";
import { describeEachEngine } from "../support/engines";

// 2^31 is the first integer PostgreSQL's INTEGER cannot hold (documentation §8.1.1); 2^53 is what
// the fuzzer's counterexample, the route parameter "9007199254740993", reads as
const BEYOND = [MAX_ROW_ID + 1, 2 ** 53];

describeEachEngine("ids and values beyond what PostgreSQL stores", (current) => {
  let actor: Actor;
  let sourceId = 0;
  beforeAll(async () => {
    actor = await localActor();
    const s = await createSource(sourceInput({ doi: "10.5555/range.1" }), actor);
    if (!s.ok) throw new Error(s.error.message);
    sourceId = s.data.id;
  });

  test.each(BEYOND)("a lookup of id %d is not_found, as for any id no row has", async (id) => {
    for (const r of [await getSuggestionSetView(String(id)), await openDocument(id), await getSourcePapers(id), await getRecordPage(id), await getSourcePage(id), await getSourceQuality(id)]) {
      expect(r.ok ? "ok" : r.error.code).toBe("not_found");
    }
  });

  test.each(BEYOND)("a DOI for source %d, its documents and its import presets: not found or nothing, as for a missing source", async (id) => {
    const doi = await assignSourceDoi(id, "10.5555/range.2", actor);
    expect(doi.ok ? "ok" : doi.error.code).toBe("not_found");
    const docs = await listDocuments(id);
    expect(docs.ok ? docs.data : docs.error.code).toEqual([]);
    const named = await saveImportPreset({ name: "range preset", sourceId: null, mapping: { columns: {} } }, actor);
    expect(named.ok).toBe(true);
    const presets = await listImportPresets(id);
    expect(presets.ok ? presets.data.map((p) => p.name) : presets.error.code).toEqual(["range preset"]);
    const preset = await getImportPreset(id);
    expect(preset.ok ? "ok" : preset.error.code).toBe("not_found");
    const own = await saveImportPreset({ name: "range preset", sourceId: id, mapping: { columns: {} } }, actor);
    expect(own.ok ? "ok" : own.error.code).toBe("invalid_input");
  });

  test("the largest id PostgreSQL stores is looked up like any other (not found, not refused)", async () => {
    const r = await getRecordPage(MAX_ROW_ID);
    expect(r.ok ? "ok" : r.error.code).toBe("not_found");
  });

  test.each(BEYOND)("an edit naming id or version %d is invalid_input naming the field, and writes nothing", async (n) => {
    const before = await sql().get<{ n: number }>(`SELECT COUNT(*) AS "n" FROM "AuditEvent"`);
    const flag = await resolveFlag({ flagId: n, action: "waive", reason: "range" }, actor);
    expect(flag.ok ? null : flag.error.details?.fieldErrors?.flagId).toContain("Give a whole number up to 2,147,483,647.");
    const record = await updateRecord({ ...mixedUnitRecord(sourceId), id: 1, version: n }, actor);
    expect(record.ok ? null : record.error.details?.fieldErrors?.version).toContain("Ids and versions are whole numbers up to 2,147,483,647.");
    const wrongSource = await updateRecord({ ...mixedUnitRecord(n), id: 1, version: 1 }, actor);
    expect(wrongSource.ok ? null : wrongSource.error.details?.fieldErrors?.sourceId).toContain("Choose the source this record comes from.");
    expect(await sql().get<{ n: number }>(`SELECT COUNT(*) AS "n" FROM "AuditEvent"`)).toEqual(before);
  });

  const TABLES = ["Source", "BuildRecord", "User", "ImportRun", "AuditEvent", "Material"];
  const counts = async () => Promise.all(TABLES.map(async (t) => Number((await sql().get<{ n: number }>(`SELECT COUNT(*) AS "n" FROM "${t}"`))!.n)));
  const fieldErrorsOf = (r: { ok: boolean; error?: { details?: { fieldErrors?: unknown } } }) => (r.ok ? "ok" : r.error!.details?.fieldErrors);

  test("text with a NUL character is invalid_input naming the field, and writes nothing", async () => {
    const before = await counts();
    expect(fieldErrorsOf(await createSource(sourceInput({ doi: null, title: "A ti\u0000tle of a source" }), actor))).toEqual({ title: [NUL_MESSAGE] });
    expect(fieldErrorsOf(await createRecord(mixedUnitRecord(sourceId, { alloy: "316\u0000L" }), actor))).toEqual({ alloy: [NUL_MESSAGE] });
    expect(fieldErrorsOf(await addUser({ name: "Nul\u0000 Person", role: "contributor" }, actor))).toEqual({ name: [NUL_MESSAGE] });
    expect(await counts()).toEqual(before);
  });

  test("a filter with a NUL character is invalid_input naming it", async () => {
    expect(fieldErrorsOf(await listRecords({ search: "a\u0000" }))).toEqual({ search: [NUL_MESSAGE] });
    expect(fieldErrorsOf(await listRecords({ alloy: ["31\u00006L"] }))).toEqual({ "alloy[0]": [NUL_MESSAGE] });
    expect(fieldErrorsOf(await getCoverage({ alloy: "31\u00006L" }))).toEqual({ alloy: [NUL_MESSAGE] });
  });

  test("an imported cell with a NUL character is a row error naming the field, and the import writes nothing", async () => {
    const before = await counts();
    const text = "Alloy\tPower (W)\tSpeed (mm/s)\tDOI\n316L\t200\t800\t10.5555/range.1\n31\u00006L\t200\t800\t10.5555/range.1\n316L\t210\t800\t10.5555/x\u0000y";
    const r = await commitImport({ kind: "paste", text, fileName: "nul.tsv" }, { mapping: null, sourceId: null, excludeErrors: false, deferChecks: true }, actor);
    const rowErrors = r.ok ? [] : ((r.error.details?.rowErrors ?? []) as { row: number; field: string; message: string }[]);
    expect(rowErrors.filter((e) => e.message === NUL_MESSAGE).map((e) => [e.row, e.field])).toEqual([[2, "alloy"]]);
    // no DOI holds a control character: the cell is not a DOI, on both engines
    expect(rowErrors.filter((e) => e.row === 3).map((e) => e.field)).toContain("doi");
    expect(await counts()).toEqual(before);
  });

  test("what the database itself refuses becomes invalid_input or conflict, never internal", async () => {
    const write = (text: string, params: (string | number)[]) => guard(async () => ok(await sql().run(text, params)));
    const big = await write(`UPDATE "Source" SET "version" = ? WHERE "id" = ?`, [2 ** 40, sourceId]);
    const nul = await write(`UPDATE "Source" SET "title" = ? WHERE "id" = ?`, ["a\u0000b", sourceId]);
    const dup = await write(`INSERT INTO "User" ("name", "role") SELECT "name", "role" FROM "User" ORDER BY "id" LIMIT 1`, []);
    if (current().engine === "postgresql") {
      // 22003 numeric_value_out_of_range, 23505 unique_violation (PostgreSQL documentation, Appendix A)
      expect(big.ok ? "ok" : [big.error.code, big.error.details?.sqlstate]).toEqual(["invalid_input", "22003"]);
      // pg sends text as UTF-8 bytes, where the server meets 0x00: 22021 character_not_in_repertoire (22P05 where it converts)
      expect(nul.ok ? "ok" : nul.error.code).toBe("invalid_input");
      expect(["22021", "22P05"]).toContain(nul.ok ? "" : nul.error.details?.sqlstate);
      expect(nul.ok ? "" : nul.error.message).toMatch(/NUL character/);
    } else {
      // SQLite keeps 64-bit integers and NUL characters in text
      expect(big.ok && nul.ok).toBe(true);
    }
    expect(dup.ok ? "ok" : dup.error.code).toBe("conflict");
  });
});

describe("postgresCodeOf", () => {
  test("reads a pg error's SQLSTATE and the one the Prisma adapter keeps, and nothing from other errors", () => {
    expect(postgresCodeOf({ code: "22003", severity: "ERROR", message: "integer out of range" })).toBe("22003");
    expect(postgresCodeOf({ meta: { driverAdapterError: { cause: { originalCode: "22P05", kind: "postgres" } } } })).toBe("22P05");
    expect(postgresCodeOf({ code: "SQLITE_BUSY", message: "busy" })).toBeNull();
    expect(postgresCodeOf({ code: "ENOENT" })).toBeNull();
    expect(postgresCodeOf(new Error("x"))).toBeNull();
  });
});
