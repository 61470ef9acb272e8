// Values PostgreSQL refuses that SQLite would take (found by fuzz-routes.test.ts): an id beyond
// INTEGER names no row on either engine and is refused alike on both, never as `internal`; and
// guard() turns PostgreSQL's refusals of out-of-range numbers and untranslatable text into
// `invalid_input`, and a duplicate key on either engine into `conflict`.
import { beforeAll, describe, expect, test } from "vitest";
import { sql } from "@/lib/db/sql";
import { localActor, type Actor } from "@/lib/server/actor";
import { getSourcePapers, openDocument } from "@/lib/server/files";
import { getRecordPage, updateRecord } from "@/lib/server/records";
import { resolveFlag } from "@/lib/server/review";
import { getSourceQuality } from "@/lib/server/source-quality";
import { createSource, getSourcePage } from "@/lib/server/sources";
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
