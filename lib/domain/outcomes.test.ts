import { describe, expect, test } from "vitest";
import fc from "fast-check";
import { OUTCOMES, isOutcome, mapOutcome, outcomeLabel, type Outcome } from "./outcomes";

describe("mapOutcome", () => {
  test.each<[string, Outcome]>([
    // the vocabulary itself, in any case and spelling of the separator
    ["dense", "dense"],
    ["KEYHOLE", "keyhole"],
    ["lack_of_fusion", "lack_of_fusion"],
    ["Lack of fusion", "lack_of_fusion"],
    ["balling", "balling"],
    ["cracking", "cracking"],
    ["other", "other"],
    // success
    ["desirable", "dense"],
    ["Desirable", "dense"],
    ["good", "dense"],
    ["fully dense", "dense"],
    ["Fully-dense", "dense"],
    ["success", "dense"],
    ["successful", "dense"],
    ["sound", "dense"],
    ["crack-free", "dense"],
    ["no cracks", "dense"],
    ["no visible pores", "dense"],
    ["defect free", "dense"],
    // keyhole
    ["KH", "keyhole"],
    ["keyholing", "keyhole"],
    ["key-hole", "keyhole"],
    ["keyhole porosity", "keyhole"],
    ["Keyhole pores", "keyhole"],
    // lack of fusion
    ["LOF", "lack_of_fusion"],
    ["lof", "lack_of_fusion"],
    ["lack-of-fusion", "lack_of_fusion"],
    ["unfused", "lack_of_fusion"],
    ["unfused powder", "lack_of_fusion"],
    ["unmelted particles", "lack_of_fusion"],
    ["incomplete fusion", "lack_of_fusion"],
    ["LOF porosity", "lack_of_fusion"],
    // balling
    ["Balling", "balling"],
    ["beading", "balling"],
    ["balled", "balling"],
    ["humping", "balling"],
    // cracking
    ["crack", "cracking"],
    ["cracked", "cracking"],
    ["cracks", "cracking"],
    ["hot cracking", "cracking"],
    ["solidification cracking", "cracking"],
    ["dense but cracked", "cracking"], // a mechanism outranks "dense"
    // ambiguous porosity and other failures
    ["porous", "other"],
    ["porosity", "other"],
    ["gas pores", "other"],
    ["not dense", "other"],
    ["non-dense", "other"],
    ["undesirable", "other"],
    ["failed", "other"],
    ["delamination", "other"],
    // explicit unknowns
    ["unknown", "unknown"],
    ["n/a", "unknown"],
    ["not reported", "unknown"],
    ["not assessed", "unknown"],
    ["?", "unknown"],
  ])("%j -> %s", (text, outcome) => {
    expect(mapOutcome(text)).toEqual({ outcome, matched: true });
  });

  test.each(["", "   ", "see text", "specimen 4", "blue"])("%j is not matched", (text) => {
    expect(mapOutcome(text)).toEqual({ outcome: "unknown", matched: false });
  });

  test("keyhole outranks lack of fusion in a text naming both", () => {
    expect(mapOutcome("keyhole and lack of fusion").outcome).toBe("keyhole");
  });

  test("diacritics and surrounding punctuation do not matter", () => {
    expect(mapOutcome("  «Désirable»  ").outcome).toBe("dense");
  });

  test("always returns a vocabulary outcome, and unknown whenever unmatched", () => {
    fc.assert(
      fc.property(fc.string(), (text) => {
        const { outcome, matched } = mapOutcome(text);
        expect(OUTCOMES).toContain(outcome);
        if (!matched) expect(outcome).toBe("unknown");
      }),
    );
  });

  test("every outcome id and label maps back to itself", () => {
    for (const o of OUTCOMES) {
      expect(mapOutcome(o).outcome).toBe(o);
      expect(mapOutcome(outcomeLabel(o)).outcome).toBe(o);
    }
  });
});

describe("outcomeLabel and isOutcome", () => {
  test.each<[Outcome, string]>([
    ["dense", "Dense"],
    ["keyhole", "Keyhole"],
    ["lack_of_fusion", "Lack of fusion"],
    ["balling", "Balling"],
    ["cracking", "Cracking"],
    ["other", "Other"],
    ["unknown", "Unknown"],
  ])("%s -> %s", (o, label) => {
    expect(outcomeLabel(o)).toBe(label);
  });

  test.each<[string, boolean]>([
    ["dense", true],
    ["lack_of_fusion", true],
    ["Dense", false],
    ["porous", false],
  ])("isOutcome(%j) is %s", (text, expected) => {
    expect(isOutcome(text)).toBe(expected);
  });
});
