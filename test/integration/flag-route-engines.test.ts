// POST /api/flags/:id through its route handler, on both engines: a loopback request in local mode
// waives a flag, a second reviewer with the same version gets a 409 naming who acted, and many
// requests at once each land exactly once with one audit event.
import { NextRequest } from "next/server";
import { beforeAll, expect, test } from "vitest";
import { POST } from "@/app/api/flags/[id]/route";
import { listAuditFor } from "@/lib/db/audit";
import { localActor, type Actor } from "@/lib/server/actor";
import { listFlags } from "@/lib/server/flags";
import { createRecord } from "@/lib/server/records";
import { createSource } from "@/lib/server/sources";
import { mixedUnitRecord, sourceInput } from "../support/fixtures";
import { describeEachEngine } from "../support/engines";

function post(flagId: number, body: unknown) {
  const request = new NextRequest(`http://127.0.0.1:3000/api/flags/${flagId}`, {
    method: "POST",
    headers: new Headers({ host: "127.0.0.1:3000", "content-type": "application/json" }),
    body: JSON.stringify(body),
  });
  return POST(request, { params: Promise.resolve({ id: String(flagId) }) });
}

describeEachEngine("POST /api/flags/:id", () => {
  let actor: Actor;
  const flagIds: { id: number; version: number }[] = [];

  beforeAll(async () => {
    actor = await localActor();
    const s = await createSource(sourceInput(), actor);
    if (!s.ok) throw new Error(s.error.message);
    // a layer far too thick: one range flag per record
    for (let i = 0; i < 21; i++) {
      const r = await createRecord(mixedUnitRecord(s.data.id, { layerThickness: { value: String(0.3 + i / 100), unit: "mm" }, laserPower: { value: String(200 + i), unit: "W" } }), actor);
      if (!r.ok) throw new Error(JSON.stringify(r.error));
      const flags = await listFlags({ recordId: r.data.id, codePrefix: "range.layer" });
      if (!flags.ok || flags.data.length !== 1) throw new Error("expected one layer flag");
      flagIds.push({ id: flags.data[0]!.id, version: flags.data[0]!.version });
    }
  });

  test("a waiver is a 200 with the flag's new state; the same version again is a 409 naming who acted", async () => {
    const [f] = flagIds;
    const res = await post(f!.id, { version: f!.version, action: "waive", reason: "thick layers are the subject" });
    expect(res.status).toBe(200);
    expect(await res.json()).toMatchObject({ flagId: f!.id, state: "waived", resolution: "waive" });
    const again = await post(f!.id, { version: f!.version, action: "waive", reason: "me too" });
    expect(again.status).toBe(409);
    expect(((await again.json()) as { error: { message: string } }).error.message).toMatch(new RegExp(`by ${actor.name}`));
    const missing = await post(f!.id, { version: f!.version + 1, action: "waive" });
    expect(missing.status).toBe(400); // no reason
  });

  test("twenty requests at once, two per flag: each flag waived once, one audit event each, the other request a 409", async () => {
    const targets = flagIds.slice(1, 11);
    const requests = targets.flatMap((f) => [1, 2].map((n) => ({ f, n })));
    const responses = await Promise.all(requests.map(({ f, n }) => post(f.id, { version: f.version, action: "waive", reason: `reviewer ${n}` })));
    for (const f of targets) {
      const statuses = responses.filter((_, i) => requests[i]!.f === f).map((r) => r.status).sort();
      expect(statuses).toEqual([200, 409]);
      expect((await listAuditFor("flag", f.id)).map((e) => e.action)).toEqual(["waive"]);
    }
    const waived = await listFlags({ state: "waived" });
    expect(waived.ok && waived.data.filter((f) => targets.some((t) => t.id === f.id)).every((f) => f.version === 2)).toBe(true);
  });
});
