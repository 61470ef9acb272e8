import { afterAll, beforeAll, describe, expect, test } from "vitest";
import { sqlite } from "@/lib/db/connection";
import { loadCheckRecords, recordKeys } from "@/lib/db/check-inputs";
import { migrate } from "@/lib/db/migrate";
import { localActor } from "@/lib/server/actor";
import { insertRecordsBulk } from "@/lib/server/records-bulk";
import { createSource } from "@/lib/server/sources";
import { mixedUnitRecord, sourceInput } from "../support/fixtures";
import { useTempDatabase } from "../support/temp-db";

const tmp = useTempDatabase("check-inputs");
let ids: number[] = [];

beforeAll(async () => {
  migrate(sqlite());
  const actor = await localActor();
  const s = await createSource(sourceInput(), actor);
  if (!s.ok) throw new Error("source");
  // 316L holds most records, IN718 a few, Ti-6Al-4V one rejected record.
  const rows = [
    ...Array.from({ length: 30 }, (_, i) => mixedUnitRecord(s.data.id, { alloy: "316L", laserPower: { value: String(150 + i), unit: "W" } })),
    ...Array.from({ length: 5 }, (_, i) => mixedUnitRecord(s.data.id, { alloy: "IN718", laserPower: { value: String(250 + i), unit: "W" } })),
    mixedUnitRecord(s.data.id, { alloy: "Ti-6Al-4V" }),
  ];
  const r = await insertRecordsBulk(rows, actor, { deferChecks: true });
  if (!r.ok) throw new Error(r.error.message);
  ids = r.data.ids;
  sqlite().prepare(`UPDATE BuildRecord SET status = 'rejected' WHERE id = ?`).run(ids[35]);
});
afterAll(() => tmp.cleanup());

describe("loadCheckRecords", () => {
  const idsOf = (alloys: string[] | "all") => loadCheckRecords(sqlite(), alloys).map((r) => r.id);

  test("by alloys gives the same active records in id order whether it scans the table (most records asked for) or uses the index (few)", () => {
    expect(idsOf(["316L"])).toEqual(ids.slice(0, 30)); // 30 of 35 active: one scan, filtered
    expect(idsOf(["IN718"])).toEqual(ids.slice(30, 35)); // 5 of 35: index lookups
    expect(idsOf(["IN718", "316L"])).toEqual(ids.slice(0, 35));
    expect(idsOf(["Ti-6Al-4V"])).toEqual([]); // rejected records are not checked
    expect(idsOf("all")).toEqual(ids.slice(0, 35));
    expect(loadCheckRecords(sqlite(), ["316L"])[3]!.laserPowerW).toBe(153);
  });
});

describe("recordKeys", () => {
  test("answers the same for consecutive ids (one range query) and scattered ones", () => {
    const many = Array.from({ length: 600 }, (_, i) => ids[0]! + i); // consecutive, past the last record
    const keys = recordKeys(sqlite(), many);
    expect(keys.map((k) => k.id)).toEqual(ids);
    expect(keys.at(-1)).toEqual({ id: ids[35], alloyKey: "Ti-6Al-4V", status: "rejected" });
    const scattered = recordKeys(sqlite(), [ids[2]!, ids[31]!]);
    expect(scattered).toEqual([{ id: ids[2], alloyKey: "316L", status: "needs_review" }, { id: ids[31], alloyKey: "IN718", status: "needs_review" }]);
  });
});
