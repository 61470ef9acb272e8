import { describe, expect, test } from "vitest";
import fc from "fast-check";
import { normalizeDoi, titleKey } from "./doi";

describe("normalizeDoi", () => {
  test.each<[string, string]>([
    ["10.5555/abc.123", "10.5555/abc.123"],
    ["10.5555/ABC.123", "10.5555/abc.123"],
    ["  10.5555/abc  ", "10.5555/abc"],
    ["doi:10.5555/abc", "10.5555/abc"],
    ["DOI: 10.5555/abc", "10.5555/abc"],
    ["doi 10.5555/abc", "10.5555/abc"],
    ["https://doi.org/10.5555/abc", "10.5555/abc"],
    ["http://doi.org/10.5555/abc", "10.5555/abc"],
    ["http://dx.doi.org/10.5555/abc", "10.5555/abc"],
    ["https://dx.doi.org/10.5555/abc", "10.5555/abc"],
    ["HTTPS://DOI.ORG/10.5555/ABC", "10.5555/abc"],
    ["doi.org/10.5555/abc", "10.5555/abc"],
    ["https://doi.org/10.5555%2Fabc", "10.5555/abc"],
    ["10.5555/abc.", "10.5555/abc"],
    ["(10.5555/abc);", "10.5555/abc"],
    ["<https://doi.org/10.5555/abc>", "10.5555/abc"],
    ["“10.5555/abc”", "10.5555/abc"],
    ["10.1016/0022-2836(05)80360-2", "10.1016/0022-2836(05)80360-2"],
    ["(10.5555/s0022(05)8)", "10.5555/s0022(05)8"],
    ["10.123456789/x", "10.123456789/x"],
  ])("%j -> %j", (text, doi) => {
    expect(normalizeDoi(text)).toBe(doi);
  });

  test.each([
    "",
    "not a doi",
    "10.123/abc", // registrant code too short
    "10.1234567890/abc", // too long
    "10.5555/", // no suffix
    "10.5555/has space",
    "11.5555/abc",
    "https://example.org/10.5555/abc",
    "https://doi.org/10.5555%ZZabc",
    "10.5555/nul\u0000here", // a control character (PostgreSQL text cannot even hold NUL)
    "https://doi.org/10.5555/esc%00aped",
  ])("%j -> null", (text) => {
    expect(normalizeDoi(text)).toBeNull();
  });

  test("is idempotent and always matches the DOI pattern", () => {
    const doi = fc
      .tuple(fc.stringMatching(/^\d{4,9}$/), fc.stringMatching(/^[A-Za-z0-9.()\-_;/]{1,30}$/))
      .map(([registrant, suffix]) => `10.${registrant}/${suffix}`);
    fc.assert(
      fc.property(doi, fc.constantFrom("", "doi:", "https://doi.org/", "http://dx.doi.org/ "), (d, prefix) => {
        const once = normalizeDoi(`${prefix}${d}`);
        if (once !== null) {
          expect(once).toMatch(/^10\.\d{4,9}\/\S+$/);
          expect(normalizeDoi(once)).toBe(once);
        }
      }),
    );
  });
});

describe("titleKey", () => {
  test.each<[string, string]>([
    ["Laser Powder Bed Fusion", "laser powder bed fusion"],
    ["Laser-powder bed fusion.", "laser powder bed fusion"],
    ["  Laser   powder\tbed fusion ", "laser powder bed fusion"],
    ["Ti–6Al–4V: a study", "ti 6al 4v a study"],
    ["Über die Schmelze", "uber die schmelze"],
    ["Étude de l’alliage", "etude de l alliage"],
    ["Straße & Brücke", "strasse and brucke"],
    ["Ørsted-like melt pools", "orsted like melt pools"],
    ["Density (%) vs. E_v", "density vs e v"],
    ["", ""],
  ])("%j -> %j", (title, key) => {
    expect(titleKey(title)).toBe(key);
  });

  test("variants of one title give one key", () => {
    const a = titleKey("Process Windows for AlSi10Mg in L-PBF");
    const b = titleKey("process windows for alsi10mg in l pbf.");
    expect(a).toBe(b);
  });

  test("is idempotent and has no punctuation or double spaces", () => {
    fc.assert(
      fc.property(fc.string(), (title) => {
        const key = titleKey(title);
        expect(titleKey(key)).toBe(key);
        expect(key).not.toMatch(/\s{2}|^\s|\s$/);
        expect(key).toBe(key.toLowerCase());
      }),
    );
  });
});
