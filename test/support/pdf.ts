/**
 * A tiny PDF writer for tests: pages of text objects in Helvetica (one of the 14 standard fonts,
 * so no font file is embedded), laid out at given positions, with a correct cross-reference
 * table (ISO 32000-1, 7.5). Enough for pdf.js to render the page and return its text items.
 */

export interface PdfTextSpec {
  text: string;
  /** Left end of the baseline, in points from the page's bottom-left corner. */
  x: number;
  y: number;
  size?: number;
}

/** A filled mark or a stroked line, in points from the page's bottom-left corner; colour as RGB 0–1. */
export type PdfShapeSpec =
  | { kind: "square" | "circle"; x: number; y: number; size: number; rgb: readonly [number, number, number] }
  | { kind: "line"; x0: number; y0: number; x1: number; y1: number; width?: number; rgb?: readonly [number, number, number] };

export interface PdfPageSpec {
  texts: PdfTextSpec[];
  /** Drawn before the text. */
  shapes?: PdfShapeSpec[];
  /** Page size in points; A4 (595 × 842) by default. */
  width?: number;
  height?: number;
}

function escapeText(s: string): string {
  // Helvetica with WinAnsiEncoding covers Latin-1; anything beyond is replaced
  return s.replace(/[\\()]/g, (c) => `\\${c}`).replace(/[^\x20-\xff]/g, "?");
}

// Four cubic Béziers approximate a circle with control points at k·r from the ends,
// k = 4(√2 − 1)/3 ≈ 0.5523 (the standard quarter-circle fit; exact at the eight touch points).
const BEZIER_CIRCLE_K = (4 * (Math.SQRT2 - 1)) / 3;

function shapeOperators(s: PdfShapeSpec): string {
  const n = (v: number) => Number(v.toFixed(3));
  if (s.kind === "line") {
    const [r, g, b] = s.rgb ?? [0, 0, 0];
    return `q ${r} ${g} ${b} RG ${s.width ?? 1} w ${n(s.x0)} ${n(s.y0)} m ${n(s.x1)} ${n(s.y1)} l S Q`;
  }
  const [r, g, b] = s.rgb;
  const h = s.size / 2;
  if (s.kind === "square") return `q ${r} ${g} ${b} rg ${n(s.x - h)} ${n(s.y - h)} ${n(s.size)} ${n(s.size)} re f Q`;
  const k = BEZIER_CIRCLE_K * h;
  const { x, y } = s;
  return [
    `q ${r} ${g} ${b} rg ${n(x + h)} ${n(y)} m`,
    `${n(x + h)} ${n(y + k)} ${n(x + k)} ${n(y + h)} ${n(x)} ${n(y + h)} c`,
    `${n(x - k)} ${n(y + h)} ${n(x - h)} ${n(y + k)} ${n(x - h)} ${n(y)} c`,
    `${n(x - h)} ${n(y - k)} ${n(x - k)} ${n(y - h)} ${n(x)} ${n(y - h)} c`,
    `${n(x + k)} ${n(y - h)} ${n(x + h)} ${n(y - k)} ${n(x + h)} ${n(y)} c f Q`,
  ].join(" ");
}

/** Writes a PDF whose pages hold the given shapes and text objects. */
export function makePdf(pages: PdfPageSpec[]): Buffer {
  const objects: string[] = [];
  const add = (body: string) => {
    objects.push(body);
    return objects.length;
  };
  const catalog = add("");
  const pagesObj = add("");
  const font = add("<< /Type /Font /Subtype /Type1 /BaseFont /Helvetica /Encoding /WinAnsiEncoding >>");
  const kids: number[] = [];
  for (const page of pages) {
    const content = [...(page.shapes ?? []).map(shapeOperators), ...page.texts.map((t) => `BT /F1 ${t.size ?? 10} Tf ${t.x} ${t.y} Td (${escapeText(t.text)}) Tj ET`)].join("\n");
    const stream = add(`<< /Length ${Buffer.byteLength(content, "latin1")} >>\nstream\n${content}\nendstream`);
    kids.push(add(`<< /Type /Page /Parent ${pagesObj} 0 R /MediaBox [0 0 ${page.width ?? 595} ${page.height ?? 842}] /Resources << /Font << /F1 ${font} 0 R >> >> /Contents ${stream} 0 R >>`));
  }
  objects[catalog - 1] = `<< /Type /Catalog /Pages ${pagesObj} 0 R >>`;
  objects[pagesObj - 1] = `<< /Type /Pages /Kids [${kids.map((k) => `${k} 0 R`).join(" ")}] /Count ${kids.length} >>`;

  let out = "%PDF-1.4\n%\xe2\xe3\xcf\xd3\n";
  const offsets: number[] = [];
  objects.forEach((body, i) => {
    offsets.push(Buffer.byteLength(out, "latin1"));
    out += `${i + 1} 0 obj\n${body}\nendobj\n`;
  });
  const xref = Buffer.byteLength(out, "latin1");
  out += `xref\n0 ${objects.length + 1}\n0000000000 65535 f \n${offsets.map((o) => `${String(o).padStart(10, "0")} 00000 n \n`).join("")}`;
  out += `trailer\n<< /Size ${objects.length + 1} /Root ${catalog} 0 R >>\nstartxref\n${xref}\n%%EOF\n`;
  return Buffer.from(out, "latin1");
}

/**
 * An invented two-page paper: a title page with its DOI and a page with a parameter table.
 * Returns the PDF and where the table sits, so a test can box it.
 */
export function inventedPaperPdf(): { pdf: Buffer; tableBox: { x: number; y: number; width: number; height: number }; doi: string } {
  const doi = "10.5555/intake.pdf.0001";
  const cols = [72, 190, 300, 410];
  const rows = [
    ["Alloy", "P (W)", "v (mm/s)", "Result"],
    ["316L", "200", "800", "dense"],
    ["316L", "250", "1200", "lack of fusion"],
    ["316L", "300", "600", "keyhole"],
  ];
  const top = 600;
  const texts: PdfTextSpec[] = [{ text: "Table 2. Process parameters of an invented study.", x: 72, y: 640, size: 10 }];
  rows.forEach((r, i) => r.forEach((text, c) => texts.push({ text, x: cols[c]!, y: top - i * 16, size: 10 })));
  texts.push({ text: "Page 2 of an invented paper", x: 72, y: 60, size: 8 });
  const pdf = makePdf([
    {
      texts: [
        { text: "Process windows of 316L in an invented study", x: 72, y: 760, size: 16 },
        { text: "Example Test Laboratory", x: 72, y: 735, size: 11 },
        { text: `https://doi.org/${doi.toUpperCase()}`, x: 72, y: 715, size: 9 },
      ],
    },
    { texts },
  ]);
  return { pdf, tableBox: { x: 60, y: top - 3 * 16 - 6, width: 480, height: 3 * 16 + 20 }, doi };
}

export interface FigurePoint {
  laserPowerW: number;
  scanSpeedMmPerS: number;
  outcome: "dense" | "keyhole";
}

export interface InventedFigure {
  pdf: Buffer;
  /** The page the figure is on (1-based). */
  page: number;
  pageHeightPt: number;
  points: FigurePoint[];
  /** Two ticks per axis: where they sit on the page (points from the bottom-left) and their values. */
  ticks: { x: { xPt: number; value: number }[]; y: { yPt: number; value: number }[] };
  /** The plot's frame in points. */
  frame: { left: number; right: number; bottom: number; top: number };
  markerSizePt: number;
}

/**
 * An invented paper whose second page holds a power–speed plot: laser power on a linear x axis
 * (100–400 W), scan speed on a log y axis (100–10,000 mm/s), keyhole builds as red squares and
 * dense builds as blue circles, with tick marks and labels at both ends of each axis.
 */
export function inventedFigurePdf(): InventedFigure {
  const frame = { left: 110, right: 490, bottom: 330, top: 690 };
  const xOf = (p: number) => frame.left + ((p - 100) / 300) * (frame.right - frame.left);
  const yOf = (v: number) => frame.bottom + ((Math.log10(v) - 2) / 2) * (frame.top - frame.bottom);
  // an invented grid of builds: keyhole at high power and low speed, dense elsewhere
  const points: FigurePoint[] = [];
  for (const p of [130, 180, 230, 280, 330, 375]) {
    for (const v of [160, 420, 900, 2100, 5200]) {
      if ((p * 7 + v) % 3 === 0) continue; // leave gaps, as real figures have
      points.push({ laserPowerW: p, scanSpeedMmPerS: v, outcome: p / v > 0.3 ? "keyhole" : "dense" });
    }
  }
  const markerSizePt = 6;
  const red = [0.85, 0.1, 0.12] as const;
  const blue = [0.1, 0.25, 0.8] as const;
  const shapes: PdfShapeSpec[] = [
    { kind: "line", x0: frame.left, y0: frame.bottom, x1: frame.right, y1: frame.bottom },
    { kind: "line", x0: frame.left, y0: frame.bottom, x1: frame.left, y1: frame.top },
  ];
  const texts: PdfTextSpec[] = [];
  for (const p of [100, 400]) {
    shapes.push({ kind: "line", x0: xOf(p), y0: frame.bottom, x1: xOf(p), y1: frame.bottom - 5 });
    texts.push({ text: String(p), x: xOf(p) - 8, y: frame.bottom - 16, size: 9 });
  }
  for (const v of [100, 10000]) {
    shapes.push({ kind: "line", x0: frame.left, y0: yOf(v), x1: frame.left - 5, y1: yOf(v) });
    texts.push({ text: String(v), x: frame.left - 34, y: yOf(v) - 3, size: 9 });
  }
  for (const pt of points) shapes.push({ kind: pt.outcome === "keyhole" ? "square" : "circle", x: xOf(pt.laserPowerW), y: yOf(pt.scanSpeedMmPerS), size: markerSizePt, rgb: pt.outcome === "keyhole" ? red : blue });
  texts.push({ text: "Laser power (W)", x: 260, y: frame.bottom - 32, size: 10 });
  texts.push({ text: "Scan speed (mm/s), log scale", x: 110, y: frame.top + 12, size: 10 });
  texts.push({ text: "Fig. 3. Outcomes of an invented 316L study; hatch 100 um, layer 30 um.", x: 72, y: 280, size: 10 });
  const pdf = makePdf([
    { texts: [{ text: "Process map of 316L in an invented study", x: 72, y: 760, size: 16 }, { text: "https://doi.org/10.5555/figure.pdf.0001", x: 72, y: 735, size: 9 }] },
    { texts, shapes },
  ]);
  return {
    pdf,
    page: 2,
    pageHeightPt: 842,
    points,
    ticks: { x: [{ xPt: xOf(100), value: 100 }, { xPt: xOf(400), value: 400 }], y: [{ yPt: yOf(100), value: 100 }, { yPt: yOf(10000), value: 10000 }] },
    frame,
    markerSizePt,
  };
}
