import { describe, expect, test } from "vitest";
import fc from "fast-check";
import { FWHM_TO_ONE_OVER_E2, fromOneOverE2Diameter, gaussianSigmaFromOneOverE2, toOneOverE2Diameter } from "./spot-definition";

describe("spot definitions", () => {
  // 1.699 is the factor quoted in practice for a Gaussian (DOMAIN.md); the derived value must match it.
  test("FWHM factor matches the Gaussian 1.699", () => {
    expect(FWHM_TO_ONE_OVER_E2).toBeCloseTo(1.699, 3);
  });

  // Check from the profile itself: at r = FWHM/2 the intensity exp(-2r²/w²) is one half.
  test("FWHM radius is where a Gaussian of the converted 1/e² radius falls to half", () => {
    const fwhm = 60;
    const w = toOneOverE2Diameter(fwhm, "fwhm") / 2;
    expect(Math.exp((-2 * (fwhm / 2) ** 2) / w ** 2)).toBeCloseTo(0.5, 12);
  });

  test.each([
    ["one_over_e2", 80, 80],
    ["d4sigma", 80, 80],
    ["fwhm", 50, 84.93],
  ] as const)("%s %d µm -> %d µm (1/e²)", (def, d, expected) => {
    expect(toOneOverE2Diameter(d, def)).toBeCloseTo(expected, 2);
  });

  test.each([0, -1, Number.NaN])("rejects diameter %d", (d) => {
    expect(() => toOneOverE2Diameter(d, "fwhm")).toThrow(RangeError);
  });

  test("round trip", () => {
    fc.assert(
      fc.property(fc.double({ min: 1, max: 2000, noNaN: true }), fc.constantFrom("one_over_e2", "d4sigma", "fwhm" as const), (d, def) => {
        expect(fromOneOverE2Diameter(toOneOverE2Diameter(d, def), def)).toBeCloseTo(d, 9);
      }),
    );
  });

  test("sigma is a quarter of the 1/e² diameter", () => {
    expect(gaussianSigmaFromOneOverE2(100)).toBe(25);
  });
});
