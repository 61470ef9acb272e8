// Pasted citations and typed DOIs matched against the sources already held, on both engines.
import { beforeAll, expect, test } from "vitest";
import { localActor } from "@/lib/server/actor";
import { lookupDoi, readCitations } from "@/lib/server/citations";
import { createSource, listSources } from "@/lib/server/sources";
import { describeEachEngine } from "../support/engines";
import { sourceInput } from "../support/fixtures";

describeEachEngine("citations", () => {
let existingId: number;
let sameTitleId: number;

beforeAll(async () => {
  const actor = await localActor();
  const a = await createSource(sourceInput({ doi: "10.5555/cite.0001", title: "Melt pools in an invented alloy" }), actor);
  const b = await createSource(sourceInput({ doi: null, title: "Keyholes in a fictional steel", year: 2020 }), actor);
  if (!a.ok || !b.ok) throw new Error("sources");
  existingId = a.data.id;
  sameTitleId = b.data.id;
});

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
  test("sources are listed newest year first, those without a year last, ties by id", async () => {
    const actor = await localActor();
    for (const [title, year] of [["An invented note without a year", null], ["A later invented study", 2024], ["A second note without a year", null]] as const) {
      const r = await createSource(sourceInput({ doi: null, title, year }), actor);
      if (!r.ok) throw new Error(r.error.message);
    }
    const listed = await listSources();
    if (!listed.ok) throw new Error(listed.error.message);
    const years = listed.data.map((s) => s.year);
    expect(years).toEqual([2024, 2022, 2020, null, null]);
    const undated = listed.data.filter((s) => s.year === null).map((s) => s.id);
    expect(undated).toEqual([...undated].sort((a, b) => a - b));
  });
});
