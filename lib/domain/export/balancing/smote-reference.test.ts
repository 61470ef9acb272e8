// SMOTE against imbalanced-learn (Debian's python3-imblearn) on the same data: the same counts
// per class, every synthetic point on a segment between a minority point and one of its k nearest
// minority neighbours, and the same distribution (means and spreads close). Reference: Chawla,
// Bowyer, Hall & Kegelmeyer, JAIR 16:321–357, 2002; script test/reference/smote_reference.py.
import { execFileSync } from "node:child_process";
import path from "node:path";
import { expect, test } from "vitest";
import { createPrng } from "../../prng";
import { meanAndSpread } from "./gaussian";
import { bruteForceNeighbours } from "./kd-tree";
import { smote } from "./smote";

const SCRIPT = path.resolve(import.meta.dirname, "../../../../test/reference/smote_reference.py");

function onSomeSegment(p: readonly number[], minority: readonly (readonly number[])[], k: number, tol = 1e-7): boolean {
  for (let i = 0; i < minority.length; i++) {
    const a = minority[i]!;
    for (const j of bruteForceNeighbours(minority, i, k)) {
      const b = minority[j]!;
      // p = a + g·(b − a) for one g in [0, 1]
      let g: number | null = null;
      let ok = true;
      for (let d = 0; d < a.length && ok; d++) {
        const span = b[d]! - a[d]!;
        if (Math.abs(span) < 1e-12) ok = Math.abs(p[d]! - a[d]!) <= tol * (1 + Math.abs(a[d]!));
        else {
          const gd = (p[d]! - a[d]!) / span;
          if (g === null) g = gd;
          else ok = Math.abs(gd - g) <= 1e-6;
        }
      }
      if (ok && (g === null || (g >= -1e-9 && g <= 1 + 1e-9))) return true;
    }
  }
  return false;
}

test("SMOTE matches imbalanced-learn: counts, segments, means and spreads", () => {
  const rng = createPrng(17);
  const k = 5;
  // Process-parameter-like points: power (W), speed (mm/s), hatch (µm), standardized first as the export does.
  const minorityRaw = Array.from({ length: 120 }, () => [rng.normal(180, 25), rng.normal(700, 120), rng.normal(90, 12)]);
  const majorityRaw = Array.from({ length: 900 }, () => [rng.normal(260, 60), rng.normal(1200, 300), rng.normal(110, 20)]);
  const z = (xs: number[][]) => xs.map((p) => [(p[0]! - 200) / 50, (p[1]! - 1000) / 300, (p[2]! - 100) / 20]);
  const minority = z(minorityRaw);
  const majority = z(majorityRaw);
  const X = [...majority, ...minority];
  const y = [...majority.map(() => "failure"), ...minority.map(() => "success")];

  const ref = JSON.parse(execFileSync("/usr/bin/python3", [SCRIPT], { input: JSON.stringify({ X, y, k, seed: 3 }), encoding: "utf8" })) as { counts: Record<string, number>; synthetic: number[][]; synthetic_y: string[] };
  const ours = smote(minority, majority.length - minority.length, k, createPrng(3));

  // Same counts per class after resampling.
  expect({ failure: majority.length, success: minority.length + ours.points.length }).toEqual(ref.counts);
  expect(ref.synthetic_y.every((c) => c === "success")).toBe(true);

  // Every synthetic point, ours and the reference's, lies on a minority-to-neighbour segment.
  for (const p of ours.points) expect(onSomeSegment(p, minority, k)).toBe(true);
  for (const p of ref.synthetic.slice(0, 200)) expect(onSomeSegment(p, minority, k)).toBe(true);

  // Same distribution: means within 0.1 sd and spreads within 10 % (780 points each).
  const a = meanAndSpread(ours.points);
  const b = meanAndSpread(ref.synthetic);
  for (let d = 0; d < 3; d++) {
    expect(Math.abs(a.mean[d]! - b.mean[d]!)).toBeLessThan(0.1 * b.sd[d]!);
    expect(a.sd[d]! / b.sd[d]!).toBeGreaterThan(0.9);
    expect(a.sd[d]! / b.sd[d]!).toBeLessThan(1.1);
  }
}, 60_000);
