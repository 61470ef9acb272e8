import fc from "fast-check";
import { describe, expect, test } from "vitest";
import { detectMarkers, markerAt, type Rgb, type RgbaImage } from "./marker-detection";

function blank(width: number, height: number): RgbaImage {
  return { data: new Uint8ClampedArray(width * height * 4).fill(255), width, height };
}

/**
 * Draws a filled square or circle centred at (cx, cy) with edge anti-aliasing from 4×4
 * supersampling of each pixel's coverage, blended over what is there.
 */
function draw(image: RgbaImage, shape: "square" | "circle", cx: number, cy: number, sizePx: number, c: Rgb): void {
  const r = sizePx / 2;
  for (let y = Math.floor(cy - r) - 1; y <= Math.ceil(cy + r) + 1; y++) {
    for (let x = Math.floor(cx - r) - 1; x <= Math.ceil(cx + r) + 1; x++) {
      if (x < 0 || y < 0 || x >= image.width || y >= image.height) continue;
      let hits = 0;
      for (let sy = 0; sy < 4; sy++)
        for (let sx = 0; sx < 4; sx++) {
          const px = x + (sx + 0.5) / 4 - cx;
          const py = y + (sy + 0.5) / 4 - cy;
          if (shape === "square" ? Math.abs(px) <= r && Math.abs(py) <= r : px * px + py * py <= r * r) hits++;
        }
      if (!hits) continue;
      const a = hits / 16;
      const o = (y * image.width + x) * 4;
      image.data[o] = Math.round(image.data[o]! * (1 - a) + c.r * a);
      image.data[o + 1] = Math.round(image.data[o + 1]! * (1 - a) + c.g * a);
      image.data[o + 2] = Math.round(image.data[o + 2]! * (1 - a) + c.b * a);
    }
  }
}

const RED: Rgb = { r: 210, g: 30, b: 40 };
const BLUE: Rgb = { r: 30, g: 60, b: 200 };
const BLACK: Rgb = { r: 0, g: 0, b: 0 };

describe("markerAt", () => {
  test("the clicked marker's centroid, size and colour", () => {
    const img = blank(80, 80);
    draw(img, "square", 40, 30, 8, RED);
    const m = markerAt(img, { x: 41, y: 31 });
    expect(m).not.toBeNull();
    expect(m!.x).toBeCloseTo(40, 1);
    expect(m!.y).toBeCloseTo(30, 1);
    expect(m!.widthPx).toBeGreaterThanOrEqual(8);
    expect(m!.colour).toEqual(RED);
  });

  test("a click just beside a marker still finds it", () => {
    const img = blank(80, 80);
    draw(img, "circle", 40, 30, 8, RED);
    expect(markerAt(img, { x: 46, y: 30 })?.colour).toEqual(RED);
  });

  test("a click on empty paper finds nothing (the page is too big to be a marker)", () => {
    const img = blank(120, 120);
    expect(markerAt(img, { x: 10, y: 10 })).toBeNull();
  });

  test.each([
    ["width 0", { data: new Uint8ClampedArray(0), width: 0, height: 1 }],
    ["short buffer", { data: new Uint8ClampedArray(10), width: 2, height: 2 }],
  ])("an image that cannot be read throws (%s)", (_name, img) => {
    expect(() => markerAt(img, { x: 0, y: 0 })).toThrow(RangeError);
  });
});

describe("detectMarkers", () => {
  test("markers of the clicked colour and size; other colours, bigger and smaller marks and lines are left out", () => {
    const img = blank(300, 200);
    const reds = [
      [30, 40],
      [120, 60],
      [200, 150],
      [260, 30],
    ] as const;
    for (const [x, y] of reds) draw(img, "square", x, y, 7, RED);
    draw(img, "square", 80, 150, 7, BLUE);
    draw(img, "square", 150, 100, 20, RED); // a legend swatch: same colour, too big
    draw(img, "square", 60, 100, 2, RED); // a speck
    for (let x = 10; x < 290; x++) draw(img, "square", x, 190, 1, BLACK); // an axis line
    const r = detectMarkers(img, { x: 120, y: 60 });
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.markers).toHaveLength(4);
    const expected = [...reds].sort((a, b) => a[1] - b[1] || a[0] - b[0]);
    r.markers.forEach((m, i) => {
      expect(Math.abs(m.x - expected[i]![0])).toBeLessThan(0.3);
      expect(Math.abs(m.y - expected[i]![1])).toBeLessThan(0.3);
    });
  });

  test("a click on nothing is a message", () => {
    const r = detectMarkers(blank(200, 200), { x: 50, y: 50 });
    expect(r).toEqual({ ok: false, message: "No marker found at px (50, 50): click on the middle of one marker." });
  });

  test("finds every synthetic marker drawn into a buffer, each within half a pixel (property)", () => {
    const W = 240;
    const H = 180;
    const grid = fc.uniqueArray(
      fc.record({ gx: fc.integer({ min: 0, max: 9 }), gy: fc.integer({ min: 0, max: 6 }) }),
      { minLength: 1, maxLength: 20, selector: (c) => `${c.gx},${c.gy}` },
    );
    fc.assert(
      fc.property(
        grid,
        fc.array(fc.double({ min: -4, max: 4, noNaN: true }), { minLength: 40, maxLength: 40 }),
        fc.constantFrom("square" as const, "circle" as const),
        fc.integer({ min: 5, max: 10 }),
        (cells, jitter, shape, size) => {
          const img = blank(W, H);
          // cells 22 px apart keep markers of up to 10 px and 4 px of jitter apart
          const centres = cells.map((c, i) => ({ x: 14 + c.gx * 22 + jitter[i]!, y: 14 + c.gy * 22 + jitter[i + 20]! }));
          for (const c of centres) draw(img, shape, c.x, c.y, size, BLUE);
          draw(img, shape, 230, 170, size, RED);
          const r = detectMarkers(img, centres[0]!);
          expect(r.ok).toBe(true);
          if (!r.ok) return;
          expect(r.markers).toHaveLength(centres.length);
          for (const c of centres) {
            const nearest = Math.min(...r.markers.map((m) => Math.hypot(m.x - c.x, m.y - c.y)));
            expect(nearest).toBeLessThan(0.5);
          }
        },
      ),
      { numRuns: 60 },
    );
  });
});
