/**
 * Reading a table out of a boxed region of a PDF page from the page's text items (what pdf.js's
 * getTextContent gives: a string with its position and size). Items are grouped into lines by
 * their baselines, neighbouring items on a line are joined into cells by the gaps between them,
 * and cells are aligned into columns by their horizontal extent across lines.
 *
 * Coordinates are PDF user space: x to the right, y upwards, in points; (x, y) is the left end of
 * the item's baseline, as in pdf.js's transform[4], transform[5].
 */

export interface PdfTextItem {
  str: string;
  x: number;
  y: number;
  width: number;
  height: number;
}

export interface PdfBox {
  /** Left edge. */
  x: number;
  /** Bottom edge. */
  y: number;
  width: number;
  height: number;
}

export type PdfTableResult =
  | { ok: true; rows: string[][]; itemCount: number }
  | { ok: false; reason: "no_text_layer" | "empty_box"; message: string };

interface Cell {
  left: number;
  right: number;
  text: string;
}

function median(xs: number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  return s.length ? s[Math.floor(s.length / 2)]! : 0;
}

/** Whether the middle of an item lies inside the box: an item cut by the border belongs to the side holding most of it. */
function inside(item: PdfTextItem, box: PdfBox): boolean {
  const cx = item.x + item.width / 2;
  const cy = item.y + item.height / 2;
  return cx >= box.x && cx <= box.x + box.width && cy >= box.y && cy <= box.y + box.height;
}

/**
 * Normalizes a box drawn in any direction (negative width or height) to left/bottom form.
 *
 * @example
 * normalizeBox({ x: 100, y: 50, width: -40, height: -20 }); // { x: 60, y: 30, width: 40, height: 20 }
 */
export function normalizeBox(box: PdfBox): PdfBox {
  const x = box.width < 0 ? box.x + box.width : box.x;
  const y = box.height < 0 ? box.y + box.height : box.y;
  return { x, y, width: Math.abs(box.width), height: Math.abs(box.height) };
}

/**
 * Groups the text items inside `box` into rows and columns.
 *
 * - Lines: items whose baselines lie within half the median text height of each other.
 * - Cells: on a line, items are joined while the gap between them is under `cellGapEm` times the
 *   text height (a word space is about 0.25–0.3 em; table columns are set much further apart —
 *   common practice in typesetting, so the default 1 em is configurable).
 * - Columns: cells whose horizontal extents overlap across lines share a column; a line with no
 *   cell in a column gets an empty cell there.
 *
 * A page with no text items at all has no text layer (a scan); that is said plainly rather than
 * returning an empty table.
 *
 * @example
 * const items = [
 *   { str: "P (W)", x: 100, y: 700, width: 30, height: 10 }, { str: "v (mm/s)", x: 200, y: 700, width: 40, height: 10 },
 *   { str: "200", x: 100, y: 686, width: 18, height: 10 },   { str: "800", x: 200, y: 686, width: 18, height: 10 },
 * ];
 * groupPdfTable(items, { x: 90, y: 680, width: 200, height: 40 }); // { ok: true, rows: [["P (W)", "v (mm/s)"], ["200", "800"]], itemCount: 4 }
 */
export function groupPdfTable(pageItems: readonly PdfTextItem[], drawn: PdfBox, options: { cellGapEm?: number } = {}): PdfTableResult {
  const box = normalizeBox(drawn);
  for (const v of [box.x, box.y, box.width, box.height]) {
    if (!Number.isFinite(v)) throw new RangeError(`groupPdfTable: box must have finite coordinates, got ${JSON.stringify(drawn)}`);
  }
  const visible = pageItems.filter((i) => i.str.trim() !== "" && [i.x, i.y, i.width, i.height].every(Number.isFinite));
  if (!visible.length) {
    return { ok: false, reason: "no_text_layer", message: "This page has no text layer (it is probably a scanned image), so no table can be read from it. Type the values in, or paste them from a copy that has text." };
  }
  const items = visible.filter((i) => inside(i, box));
  if (!items.length) {
    return { ok: false, reason: "empty_box", message: "No text lies inside the box; draw it around the table's cells." };
  }
  const heightOf = (i: PdfTextItem) => (i.height > 0 ? i.height : 10);
  const em = median(items.map(heightOf));
  const gapLimit = (options.cellGapEm ?? 1) * em;

  // lines, top first
  const sorted = [...items].sort((a, b) => b.y - a.y || a.x - b.x);
  const lines: PdfTextItem[][] = [];
  let lineY = Number.NaN;
  for (const item of sorted) {
    const current = lines[lines.length - 1];
    if (current && Math.abs(item.y - lineY) <= em / 2) current.push(item);
    else {
      lines.push([item]);
      lineY = item.y;
    }
  }

  // cells within each line
  const cellLines: Cell[][] = lines.map((line) => {
    const byX = [...line].sort((a, b) => a.x - b.x);
    const cells: Cell[] = [];
    for (const item of byX) {
      const last = cells[cells.length - 1];
      const right = item.x + Math.max(item.width, 0);
      if (last && item.x - last.right < gapLimit) {
        const spaced = item.x - last.right > em * 0.1 && !last.text.endsWith(" ") && !item.str.startsWith(" ");
        last.text = `${last.text}${spaced ? " " : ""}${item.str}`;
        last.right = Math.max(last.right, right);
      } else {
        cells.push({ left: item.x, right, text: item.str });
      }
    }
    for (const c of cells) c.text = c.text.replace(/\s+/g, " ").trim();
    return cells;
  });

  // columns: merge overlapping horizontal extents of all cells
  const spans = cellLines
    .flat()
    .map((c) => ({ left: c.left, right: c.right }))
    .sort((a, b) => a.left - b.left);
  const columns: { left: number; right: number }[] = [];
  for (const s of spans) {
    const last = columns[columns.length - 1];
    if (last && s.left <= last.right) last.right = Math.max(last.right, s.right);
    else columns.push({ ...s });
  }
  const rows = cellLines.map((cells) => {
    const row = columns.map(() => "");
    for (const c of cells) {
      const k = columns.findIndex((col) => c.left >= col.left && c.left <= col.right);
      const at = k < 0 ? columns.length - 1 : k;
      row[at] = row[at] ? `${row[at]} ${c.text}` : c.text;
    }
    return row;
  });
  return { ok: true, rows, itemCount: items.length };
}
