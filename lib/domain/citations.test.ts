import fc from "fast-check";
import { describe, expect, test } from "vitest";
import { detectCitationFormat, parseCitations } from "./citations";

const BIBTEX = String.raw`@string{jir = {Journal of Invented Results}}
@article{placeholder2021,
  author  = {M{\"u}ller, J{\"u}rgen and van der Berg, Anna and {Example Test Laboratory}},
  title   = {Process windows of {Ti-6Al-4V} in a fictional study},
  journal = jir,
  year    = {2021},
  doi     = {https://doi.org/10.5555/TEST.0042},
}
@inproceedings{conf2019, title = "A conference paper", booktitle = {Proceedings of an Invented Symposium}, year = 2019, author = "Doe, Jane"}
@phdthesis{thesis2020, title = {An invented thesis}, school = {Invented University}, year = {2020}, author = {Roe, R.}}
@misc{notitle, year = {2020}}`;

const RIS = `TY  - JOUR
AU  - Placeholder, Anna
AU  - Example, B.
TI  - Density of parts in a fictional study
T2  - Journal of Invented Results
PY  - 2022
DO  - 10.5555/test.0001
UR  - https://example.org/paper
ER  - 

TY  - CONF
AU  - Doe, J.
TI  - An invented conference paper
T2  - Invented Symposium
PY  - 2019///
ER  - 
`;

describe("parseCitations", () => {
  test("BibTeX: accents, macros, name particles, kinds, DOI normalized, untitled entries skipped", () => {
    const r = parseCitations(BIBTEX);
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.format).toBe("bibtex");
    expect(r.entries[0]).toEqual({
      kind: "journal_article",
      title: "Process windows of Ti-6Al-4V in a fictional study",
      authors: ["Jürgen Müller", "Anna van der Berg", "Example Test Laboratory"],
      year: 2021,
      venue: "Journal of Invented Results",
      doi: "10.5555/test.0042",
      url: null,
      label: "placeholder2021",
    });
    expect(r.entries.map((e) => e.kind)).toEqual(["journal_article", "conference_paper", "thesis"]);
    expect(r.entries[1]?.venue).toBe("Proceedings of an Invented Symposium");
    expect(r.skipped).toEqual([{ label: "notitle", message: "notitle has no title." }]);
  });

  test("RIS: journal and conference entries", () => {
    const r = parseCitations(RIS);
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.format).toBe("ris");
    expect(r.entries[0]).toMatchObject({ kind: "journal_article", title: "Density of parts in a fictional study", authors: ["Anna Placeholder", "B. Example"], year: 2022, doi: "10.5555/test.0001", url: "https://example.org/paper" });
    expect(r.entries[1]).toMatchObject({ kind: "conference_paper", year: 2019, venue: "Invented Symposium" });
  });

  test.each([
    ["neither format", "Some paper, 2021, J. Invented"],
    ["a DOI alone is not looked up", "10.5555/abc"],
    ["broken BibTeX", "@article{k, title={unclosed"],
  ])("%s is a message", (_label, text) => {
    const r = parseCitations(text);
    expect(r.ok).toBe(false);
  });

  test.each([
    ["@article{k, title={T}}", "bibtex"],
    ["TY  - JOUR\nER  - ", "ris"],
    ["plain", null],
  ])("detectCitationFormat(%j) = %s", (text, format) => {
    expect(detectCitationFormat(text)).toBe(format);
  });

  test("property: never throws on text that looks like either format", () => {
    const bits = fc.constantFrom("@article{", "@book(", "TY  - JOUR\n", "TI  - ", "ER  - \n", "title={", "}", "{", ",", "=", "\"", "\\'", "a", "\n", "2021", "doi = 10.5555/x");
    fc.assert(
      fc.property(fc.array(bits, { maxLength: 20 }), (parts) => {
        const r = parseCitations(parts.join(""));
        if (r.ok) for (const e of r.entries) expect(e.title.length).toBeGreaterThan(0);
      }),
      { numRuns: 300 },
    );
  });
});
