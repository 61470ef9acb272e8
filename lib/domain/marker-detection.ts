/**
 * Finding a figure's markers in a rendered image from one marker the user clicked: the clicked
 * marker's colour and size are taken as the pattern, every connected patch of pixels of that
 * colour (within a tolerance) is found, and the patches of a similar size come back as markers
 * with their centroids.
 *
 * Images are RGBA bytes, row by row from the top-left (what a canvas's getImageData gives).
 * Pixel (i, j) has its centre at (i + 0.5, j + 0.5), so a centroid is in the same continuous
 * image coordinates as a click converted to device pixels.
 */

export interface RgbaImage {
  data: Uint8ClampedArray | Uint8Array;
  width: number;
  height: number;
}

export interface Rgb {
  r: number;
  g: number;
  b: number;
}

export interface MarkerBlob {
  /** Centroid, in image coordinates (pixel centres at i + 0.5). */
  x: number;
  y: number;
  areaPx: number;
  widthPx: number;
  heightPx: number;
  colour: Rgb;
}

export interface MarkerDetectionOptions {
  /** Largest per-channel difference (0–255) from the clicked marker's colour that still counts as the same colour. */
  colourTolerance?: number;
  /** Accepted relative difference in area from the clicked marker (0.5: half to one and a half times). */
  sizeTolerance?: number;
  /** How far from the click (in pixels) to look for the marker when the click missed it slightly. */
  seedSearchRadiusPx?: number;
  /** Patches smaller than this are noise (anti-aliasing specks). */
  minAreaPx?: number;
  /** A patch larger than this is not a marker (a filled region, a legend box, the page). */
  maxAreaPx?: number;
}

// Defaults, tuned on rendered PDF figures with anti-aliased edges (common practice for colour keying).
const DEFAULTS: Required<MarkerDetectionOptions> = { colourTolerance: 48, sizeTolerance: 0.5, seedSearchRadiusPx: 4, minAreaPx: 4, maxAreaPx: 4000 };

function checkImage(fn: string, image: RgbaImage): void {
  if (!Number.isInteger(image.width) || !Number.isInteger(image.height) || image.width <= 0 || image.height <= 0) {
    throw new RangeError(`${fn}: width and height must be positive integers, got ${image.width} × ${image.height}`);
  }
  if (image.data.length !== image.width * image.height * 4) {
    throw new RangeError(`${fn}: expected ${image.width * image.height * 4} RGBA bytes, got ${image.data.length}`);
  }
}

function colourAt(image: RgbaImage, index: number): Rgb {
  const o = index * 4;
  return { r: image.data[o]!, g: image.data[o + 1]!, b: image.data[o + 2]! };
}

function near(image: RgbaImage, index: number, c: Rgb, tolerance: number): boolean {
  const o = index * 4;
  const d = image.data;
  // a transparent pixel is background whatever its colour bytes
  if (d[o + 3]! < 128) return false;
  return Math.abs(d[o]! - c.r) <= tolerance && Math.abs(d[o + 1]! - c.g) <= tolerance && Math.abs(d[o + 2]! - c.b) <= tolerance;
}

/**
 * Labels the 4-connected patches of pixels near `colour`, stopping a patch from growing past
 * `maxAreaPx` (it is then reported with areaPx > maxAreaPx and is ignored by callers).
 */
interface Scratch {
  /** Visit stamps: a pixel is seen in this pass when it holds the pass's stamp. */
  seen: Int32Array;
  stack: Int32Array;
  stamp: number;
}

function scratchFor(image: RgbaImage): Scratch {
  return { seen: new Int32Array(image.width * image.height), stack: new Int32Array(image.width * image.height), stamp: 0 };
}

function patches(image: RgbaImage, colour: Rgb, tolerance: number, maxAreaPx: number, scratch: Scratch, only?: number): MarkerBlob[] {
  const { width, height } = image;
  const { seen, stack } = scratch;
  const stamp = ++scratch.stamp;
  const out: MarkerBlob[] = [];
  const starts = only === undefined ? null : [only];
  const total = width * height;
  for (let k = 0; k < (starts ? 1 : total); k++) {
    const start = starts ? starts[0]! : k;
    if (seen[start] === stamp || !near(image, start, colour, tolerance)) continue;
    let top = 0;
    stack[top++] = start;
    seen[start] = stamp;
    let area = 0;
    let sx = 0;
    let sy = 0;
    let minX = width;
    let maxX = -1;
    let minY = height;
    let maxY = -1;
    while (top > 0) {
      const p = stack[--top]!;
      const px = p % width;
      const py = (p - px) / width;
      area++;
      // a single-seed probe can stop once the patch is too big to be a marker; the full pass
      // must take all of it so none of it starts another patch
      if (only !== undefined && area > maxAreaPx) break;
      sx += px + 0.5;
      sy += py + 0.5;
      if (px < minX) minX = px;
      if (px > maxX) maxX = px;
      if (py < minY) minY = py;
      if (py > maxY) maxY = py;
      const push = (q: number) => {
        if (seen[q] !== stamp && near(image, q, colour, tolerance)) {
          seen[q] = stamp;
          stack[top++] = q;
        }
      };
      if (px > 0) push(p - 1);
      if (px < width - 1) push(p + 1);
      if (py > 0) push(p - width);
      if (py < height - 1) push(p + width);
    }
    if (area > maxAreaPx) {
      out.push({ x: Number.NaN, y: Number.NaN, areaPx: area, widthPx: maxX - minX + 1, heightPx: maxY - minY + 1, colour });
      continue;
    }
    out.push({ x: sx / area, y: sy / area, areaPx: area, widthPx: maxX - minX + 1, heightPx: maxY - minY + 1, colour });
  }
  return out;
}

/**
 * The marker under (or within `seedSearchRadiusPx` of) a clicked pixel: the patch of the clicked
 * colour that holds it, nearest candidate first. Null when there is no patch of marker size there.
 *
 * @example
 * markerAt(image, { x: 40, y: 60 }); // { x: 40.5, y: 60.5, areaPx: 49, widthPx: 7, heightPx: 7, colour: { r: 200, g: 30, b: 30 } }
 */
export function markerAt(image: RgbaImage, click: { x: number; y: number }, options: MarkerDetectionOptions = {}): MarkerBlob | null {
  checkImage("markerAt", image);
  return seedMarker(image, click, { ...DEFAULTS, ...options }, scratchFor(image));
}

function seedMarker(image: RgbaImage, click: { x: number; y: number }, o: Required<MarkerDetectionOptions>, scratch: Scratch): MarkerBlob | null {
  const cx = Math.floor(click.x);
  const cy = Math.floor(click.y);
  const candidates: { index: number; d2: number }[] = [];
  const r = Math.max(0, Math.floor(o.seedSearchRadiusPx));
  for (let dy = -r; dy <= r; dy++) {
    for (let dx = -r; dx <= r; dx++) {
      const x = cx + dx;
      const y = cy + dy;
      if (x < 0 || y < 0 || x >= image.width || y >= image.height || dx * dx + dy * dy > r * r) continue;
      candidates.push({ index: y * image.width + x, d2: dx * dx + dy * dy });
    }
  }
  candidates.sort((a, b) => a.d2 - b.d2);
  for (const { index } of candidates) {
    if (image.data[index * 4 + 3]! < 128) continue;
    const colour = colourAt(image, index);
    const [blob] = patches(image, colour, o.colourTolerance, o.maxAreaPx, scratch, index);
    if (!blob || blob.areaPx < o.minAreaPx || blob.areaPx > o.maxAreaPx) continue;
    // a click on an anti-aliased edge takes the edge's colour: key on the colour at the patch's middle instead
    const middle = Math.floor(blob.y) * image.width + Math.floor(blob.x);
    if (middle !== index && image.data[middle * 4 + 3]! >= 128) {
      const core = colourAt(image, middle);
      const [again] = patches(image, core, o.colourTolerance, o.maxAreaPx, scratch, middle);
      if (again && again.areaPx >= blob.areaPx && again.areaPx <= o.maxAreaPx) return again;
    }
    return blob;
  }
  return null;
}

/**
 * Every marker of the same colour and a similar size as the one at the clicked pixel, in reading
 * order (top to bottom, then left to right). The clicked marker is among them. A click on no
 * marker is a problem, returned as a value.
 *
 * @example
 * const r = detectMarkers(image, { x: 40, y: 60 });
 * r.ok && r.markers.length; // 12
 */
export function detectMarkers(
  image: RgbaImage,
  click: { x: number; y: number },
  options: MarkerDetectionOptions = {},
): { ok: true; seed: MarkerBlob; markers: MarkerBlob[] } | { ok: false; message: string } {
  checkImage("detectMarkers", image);
  const o = { ...DEFAULTS, ...options };
  const scratch = scratchFor(image);
  const seed = seedMarker(image, click, o, scratch);
  if (!seed) return { ok: false, message: `No marker found at px (${Math.round(click.x)}, ${Math.round(click.y)}): click on the middle of one marker.` };
  const lo = seed.areaPx * (1 - o.sizeTolerance);
  const hi = seed.areaPx * (1 + o.sizeTolerance);
  const sideLo = Math.max(seed.widthPx, seed.heightPx) * (1 - o.sizeTolerance);
  const sideHi = Math.max(seed.widthPx, seed.heightPx) * (1 + o.sizeTolerance);
  const markers = patches(image, seed.colour, o.colourTolerance, o.maxAreaPx, scratch).filter((b) => {
    const side = Math.max(b.widthPx, b.heightPx);
    return b.areaPx >= Math.max(o.minAreaPx, lo) && b.areaPx <= hi && side >= sideLo && side <= sideHi && Number.isFinite(b.x);
  });
  markers.sort((a, b) => a.y - b.y || a.x - b.x);
  return { ok: true, seed, markers };
}
