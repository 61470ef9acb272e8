import { afterAll, beforeAll, describe, expect, test } from "vitest";
import { sqlite } from "@/lib/db/connection";
import { migrate } from "@/lib/db/migrate";
import { localActor } from "@/lib/server/actor";
import { lookupDoi, readCitations } from "@/lib/server/citations";
import { createSource } from "@/lib/server/sources";
import { sourceInput } from "../support/fixtures";
import { useTempDatabase } from "../support/temp-db";

const tmp = useTempDatabase("citations");
let existingId: number;
let sameTitleId: number;

beforeAll(async () => {
  migrate(sqlite());
  const actor = await localActor();
  const a = await createSource(sourceInput({ doi: "10.5555/cite.0001", title: "Melt pools in an invented alloy" }), actor);
  const b = await createSource(sourceInput({ doi: null, title: "Keyholes in a fictional steel", year: 2020 }), actor);
  if (!a.ok || !b.ok) throw new Error("sources");
  existingId = a.data.id;
  sameTitleId = b.data.id;
});
afterAll(() => tmp.cleanup());

describe("citations", () => {
  test("pasted entries are offered the source they already are, by DOI or by title and year", async () => {
    const r = await readCitations(`@article{a, title={Something else}, doi={https://doi.org/10.5555/CITE.0001}, year=2021}
@article{b, title={KEYHOLES in a Fictional Steel.}, year={2020}}
@article{c, title={A new invented paper}, year={2023}, author={Doe, Jane}}`);
    if (!r.ok) throw new Error(r.error.message);
    expect(r.data.entries.map((e) => e.existing && [e.existing.id, e.existing.by])).toEqual([[existingId, "doi"], [sameTitleId, "title_year"], null]);
    expect(r.data.entries[2]).toMatchObject({ title: "A new invented paper", authors: ["Jane Doe"], year: 2023 });
  });

  test("a typed DOI is normalized and matched", async () => {
    const r = await lookupDoi(" doi:10.5555/CITE.0001 ");
    expect(r.ok && r.data).toEqual({ doi: "10.5555/cite.0001", existing: expect.objectContaining({ id: existingId, by: "doi" }) });
    const bad = await lookupDoi("not one");
    expect(!bad.ok && bad.error.code).toBe("invalid_input");
  });

  test("text that is no citation is a field error", async () => {
    const r = await readCitations("hello");
    expect(!r.ok && r.error.details?.fieldErrors?.citation).toBeTruthy();
  });
});
