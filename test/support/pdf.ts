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

export interface PdfPageSpec {
  texts: PdfTextSpec[];
  /** Page size in points; A4 (595 × 842) by default. */
  width?: number;
  height?: number;
}

function escapeText(s: string): string {
  // Helvetica with WinAnsiEncoding covers Latin-1; anything beyond is replaced
  return s.replace(/[\\()]/g, (c) => `\\${c}`).replace(/[^\x20-\xff]/g, "?");
}

/** Writes a PDF whose pages hold the given text objects. */
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
    const content = page.texts.map((t) => `BT /F1 ${t.size ?? 10} Tf ${t.x} ${t.y} Td (${escapeText(t.text)}) Tj ET`).join("\n");
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
