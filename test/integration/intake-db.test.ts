// The bulk-write building blocks of lib/db on SQLite and PostgreSQL: materials found or created
// once (also by two writers at the same time), source look-ups by DOI across several statements,
// and the sources a batch names that do not exist.
import { beforeAll, describe, expect, test } from "vitest";
import { missingSourceIds, sourceIdsByDoi } from "@/lib/db/imports";
import { materialFingerprint, materialIdFor, type MaterialSpec } from "@/lib/db/materials";
import { sql } from "@/lib/db/sql";
import { localActor, type Actor } from "@/lib/server/actor";
import { insertRecordsBulk } from "@/lib/server/records-bulk";
import { createSource } from "@/lib/server/sources";
import { newSourceId } from "../support/sources";
import { describeEachEngine } from "../support/engines";
import { mixedUnitRecord, sourceInput } from "../support/fixtures";

const spec = (designation: string): MaterialSpec => ({
  designation,
  alloyKey: designation,
  basis: "wt",
  compositionKind: "measured",
  components: [
    { element: "Ni", amount: 60, isBalance: true },
    { element: "Cr", amount: 22, isBalance: false },
    { element: "Mo", amount: 9, isBalance: false },
  ],
});

describeEachEngine("bulk-write building blocks", () => {
  let actor: Actor;
  let sourceId: number;
  beforeAll(async () => {
    actor = await localActor();
    sourceId = await newSourceId(actor, { doi: "10.5555/intake.0001", title: "An invented study of bulk writes" });
  });

  describe("materials", () => {
    test("a material is created once with its components, and found again without the caller's cache", async () => {
      const m = spec("Invented-625");
      const first = await sql().transaction((tx) => materialIdFor(tx, m, new Map()));
      const again = await sql().transaction((tx) => materialIdFor(tx, spec("Invented-625"), new Map()));
      expect(again).toBe(first);
      const rows = await sql().all<{ id: number }>(`SELECT "id" FROM "Material" WHERE "fingerprint" = ?`, [materialFingerprint(m)]);
      expect(rows).toEqual([{ id: first }]);
      const components = await sql().all<{ element: string; amount: number; isBalance: boolean }>(
        `SELECT "element", "amount", "isBalance" FROM "MaterialComponent" WHERE "materialId" = ? ORDER BY "element"`,
        [first],
      );
      expect(components).toEqual([
        { element: "Cr", amount: 22, isBalance: false },
        { element: "Mo", amount: 9, isBalance: false },
        { element: "Ni", amount: 60, isBalance: true },
      ]);
    });

    test("the caller's cache answers a second time without a query, even for a fresh spec object", async () => {
      const cache = new Map<string, number>();
      const id = await sql().transaction((tx) => materialIdFor(tx, spec("Invented-718X"), cache));
      expect(cache.get(materialFingerprint(spec("Invented-718X")))).toBe(id);
      // a cache entry is believed: the id it holds comes back as it is
      cache.set(materialFingerprint(spec("Invented-718X")), -1);
      expect(await sql().transaction((tx) => materialIdFor(tx, spec("Invented-718X"), cache))).toBe(-1);
    });

    test("two batches written at the same time with the same new composition share one material", async () => {
      const composition = "Fe bal, Cr 17.1, Ni 12.3, Mo 2.4";
      const rows = (n: number) => Array.from({ length: n }, (_, i) => mixedUnitRecord(sourceId, { alloy: "Invented steel 9", composition, locationPage: i + 1 }));
      const [a, b] = await Promise.all([insertRecordsBulk(rows(30), actor, { deferChecks: true }), insertRecordsBulk(rows(40), actor, { deferChecks: true })]);
      if (!a.ok || !b.ok) throw new Error(JSON.stringify([a, b]));
      const materials = await sql().all<{ materialId: number; n: number }>(
        `SELECT "materialId" AS "materialId", COUNT(*) AS n FROM "BuildRecord" WHERE "id" IN (${[...a.data.ids, ...b.data.ids].map(() => "?").join(", ")}) GROUP BY "materialId"`,
        [...a.data.ids, ...b.data.ids],
      );
      expect(materials).toEqual([{ materialId: expect.any(Number), n: 70 }]);
    });
  });

  describe("sources", () => {
    test("DOIs are looked up across several statements, and only those in the collection come back", async () => {
      const known: string[] = [];
      for (let i = 0; i < 3; i++) {
        const s = await createSource(sourceInput({ doi: `10.5555/intake.lookup.${i}`, title: `Invented look-up study ${i}` }), actor);
        if (!s.ok) throw new Error(s.error.message);
        known.push(`10.5555/intake.lookup.${i}`);
      }
      // 1,203 DOIs: more than two statements' worth, the known ones at the start, middle and end
      const dois = Array.from({ length: 1200 }, (_, i) => `10.5555/intake.absent.${i}`);
      dois.splice(0, 0, known[0]!);
      dois.splice(600, 0, known[1]!);
      dois.push(known[2]!);
      const found = await sourceIdsByDoi(sql(), dois);
      expect([...found.keys()].sort()).toEqual([...known].sort());
      const ids = await sql().all<{ id: number; doi: string }>(`SELECT "id", "doi" FROM "Source" WHERE "doi" LIKE '10.5555/intake.lookup.%' ORDER BY "id"`);
      expect(ids.map((r) => [r.doi, found.get(r.doi)])).toEqual(ids.map((r) => [r.doi, r.id]));
    });

    test("the sources a batch names that do not exist are named, each once", async () => {
      expect(await missingSourceIds(sql(), [sourceId, 999_001, sourceId, 999_002, 999_001])).toEqual([999_001, 999_002]);
      expect(await missingSourceIds(sql(), [])).toEqual([]);
    });
  });
});
