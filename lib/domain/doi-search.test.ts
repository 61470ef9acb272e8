import fc from "fast-check";
import { describe, expect, test } from "vitest";
import { findDois } from "./doi-search";

describe("findDois", () => {
  test.each([
    ["a resolver address and a labelled DOI", "Cite as: https://doi.org/10.5555/ABC.1. See also doi:10.5555/x (2020).", ["10.5555/abc.1", "10.5555/x"]],
    ["a DOI inside brackets keeps its own bracket", "(10.1016/0022-2836(05)80360-2)", ["10.1016/0022-2836(05)80360-2"]],
    ["repeats once", "10.5555/a and 10.5555/A", ["10.5555/a"]],
    ["none", "no identifiers here, 10.5 percent", []],
  ])("%s", (_label, text, dois) => {
    expect(findDois(text)).toEqual(dois);
  });

  test("property: a DOI placed in any prose is found", () => {
    fc.assert(
      fc.property(fc.string({ unit: fc.constantFrom("a", " ", ".", ",", "\n") }), fc.stringMatching(/^[a-z0-9]{1,8}$/), (prose, suffix) => {
        expect(findDois(`${prose} 10.5555/${suffix} ${prose}`)).toContain(`10.5555/${suffix}`);
      }),
    );
  });
});
