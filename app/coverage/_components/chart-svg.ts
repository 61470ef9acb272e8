/**
 * A chart as one standalone SVG: a title, the plot drawn by the plotting library, and a legend
 * drawn here, so what the page shows is exactly what downloads as SVG or PNG.
 */

const SVG_NS = "http://www.w3.org/2000/svg";
const FONT = 'system-ui, -apple-system, "Segoe UI", Roboto, "Noto Sans", "Liberation Sans", Arial, sans-serif';

export type LegendItem =
  | { kind: "symbol"; label: string; colour: string; symbol: string }
  | { kind: "line"; label: string; colour: string; dash: string }
  | { kind: "swatch"; label: string; colour: string }
  | { kind: "outline"; label: string; dash: string }
  | { kind: "hatch"; label: string };

function el<K extends keyof SVGElementTagNameMap>(name: K, attrs: Record<string, string | number>, text?: string): SVGElementTagNameMap[K] {
  const node = document.createElementNS(SVG_NS, name);
  for (const [k, v] of Object.entries(attrs)) node.setAttribute(k, String(v));
  if (text !== undefined) node.textContent = text;
  return node;
}

/** Paths of the symbols the scatter plot uses, centred on 0,0, about 9 px across. */
function symbolPath(symbol: string): string {
  switch (symbol) {
    case "square":
      return "M-3.6,-3.6h7.2v7.2h-7.2z";
    case "triangle":
      return "M0,-4.6L4.2,3L-4.2,3z";
    case "diamond":
      return "M0,-4.8L3.4,0L0,4.8L-3.4,0z";
    case "star":
      return "M0,-5L1.2,-1.6L4.8,-1.5L1.9,0.7L2.9,4.1L0,2.1L-2.9,4.1L-1.9,0.7L-4.8,-1.5L-1.2,-1.6z";
    case "cross":
      return "M-1.4,-4.2h2.8v2.8h2.8v2.8h-2.8v2.8h-2.8v-2.8h-2.8v-2.8h2.8z";
    case "wye":
      return "M-1,-4.5h2v3.4l3,1.7l-1,1.7l-3,-1.7l-3,1.7l-1,-1.7l3,-1.7z";
    default:
      return "M4,0A4,4,0,1,1,-4,0A4,4,0,1,1,4,0";
  }
}

/** The hatching pattern of cells outside the window; one definition per chart. */
export function hatchPattern(id: string, colour: string): SVGPatternElement {
  const p = el("pattern", { id, width: 6, height: 6, patternUnits: "userSpaceOnUse", patternTransform: "rotate(45)" });
  p.append(el("line", { x1: 0, y1: 0, x2: 0, y2: 6, stroke: colour, "stroke-width": 1.3 }));
  return p;
}

export interface ComposeOptions {
  title: string;
  description: string;
  legend: readonly LegendItem[];
  /** Elements for <defs> (patterns the plot refers to). */
  defs?: readonly SVGElement[];
  /** A line of small print under the legend (what was sampled, which plane). */
  footnote?: string;
}

/**
 * Wraps the plot in an SVG with a title, a legend and a footnote; the result stands alone
 * (namespaces, fonts and patterns inside), so serializing it gives a valid SVG file.
 */
export function composeChart(plot: SVGSVGElement, o: ComposeOptions): SVGSVGElement {
  const width = Number(plot.getAttribute("width")) || 640;
  const plotHeight = Number(plot.getAttribute("height")) || 400;
  const titleHeight = 26;
  const pad = 8;
  // Legend rows: items flow left to right, about 6.6 px per character at 12 px.
  const rows: { item: LegendItem; x: number; row: number }[] = [];
  let x = pad;
  let row = 0;
  for (const item of o.legend) {
    const w = 26 + item.label.length * 6.6 + 14;
    if (x + w > width - pad && x > pad) {
      row++;
      x = pad;
    }
    rows.push({ item, x, row });
    x += w;
  }
  const legendHeight = o.legend.length ? (row + 1) * 20 + 6 : 0;
  const footLines = o.footnote ? wrap(o.footnote, Math.floor((width - 2 * pad) / 6)) : [];
  const footHeight = footLines.length * 15 + (footLines.length ? 4 : 0);
  const height = titleHeight + plotHeight + legendHeight + footHeight + pad;

  const svg = el("svg", { xmlns: SVG_NS, width, height, viewBox: `0 0 ${width} ${height}`, role: "img", "font-family": FONT, "font-size": 12 });
  const titleId = `t${Math.random().toString(36).slice(2, 9)}`;
  svg.setAttribute("aria-labelledby", `${titleId} ${titleId}-d`);
  svg.append(el("title", { id: titleId }, o.title), el("desc", { id: `${titleId}-d` }, o.description));
  const defs = el("defs", {});
  for (const d of o.defs ?? []) defs.append(d);
  svg.append(defs);
  svg.append(el("rect", { x: 0, y: 0, width, height, fill: "#ffffff" }));
  svg.append(el("text", { x: pad, y: 18, "font-size": 14, "font-weight": 600, fill: "#1b2128" }, o.title));

  const inner = plot.cloneNode(true) as SVGSVGElement;
  inner.setAttribute("x", "0");
  inner.setAttribute("y", String(titleHeight));
  inner.removeAttribute("style");
  inner.setAttribute("overflow", "visible");
  svg.append(inner);

  const legend = el("g", { transform: `translate(0, ${titleHeight + plotHeight + 4})`, fill: "#1b2128" });
  for (const { item, x: lx, row: r } of rows) {
    const y = r * 20 + 10;
    const g = el("g", { transform: `translate(${lx}, ${y})` });
    if (item.kind === "symbol") g.append(el("path", { d: symbolPath(item.symbol), transform: "translate(9,0)", fill: item.colour, stroke: "#1b2128", "stroke-opacity": 0.6, "stroke-width": 0.75 }));
    if (item.kind === "line") g.append(el("line", { x1: 0, y1: 0, x2: 20, y2: 0, stroke: item.colour, "stroke-width": 2.5, "stroke-dasharray": item.dash || "none" }));
    if (item.kind === "swatch") g.append(el("rect", { x: 2, y: -6, width: 14, height: 12, fill: item.colour, stroke: "#1b2128", "stroke-opacity": 0.45 }));
    if (item.kind === "outline") g.append(el("rect", { x: 2, y: -6, width: 14, height: 12, fill: "none", stroke: "#1b2128", "stroke-width": 1.6, "stroke-dasharray": item.dash }));
    if (item.kind === "hatch") {
      const id = `legend-hatch-${Math.random().toString(36).slice(2, 8)}`;
      defs.append(hatchPattern(id, "#8d96a0"));
      g.append(el("rect", { x: 2, y: -6, width: 14, height: 12, fill: `url(#${id})`, stroke: "#8d96a0" }));
    }
    g.append(el("text", { x: 26, y: 4 }, item.label));
    legend.append(g);
  }
  svg.append(legend);
  footLines.forEach((line, i) => svg.append(el("text", { x: pad, y: titleHeight + plotHeight + legendHeight + 14 + i * 15, "font-size": 11, fill: "#4b5563" }, line)));
  return svg;
}

/** Splits text into lines of at most `columns` characters at spaces. */
function wrap(text: string, columns: number): string[] {
  const lines: string[] = [];
  let line = "";
  for (const word of text.split(/\s+/)) {
    if (line && line.length + 1 + word.length > columns) {
      lines.push(line);
      line = word;
    } else line = line ? `${line} ${word}` : word;
  }
  if (line) lines.push(line);
  return lines;
}

/** The chart as SVG text, with an XML declaration. */
export function serializeSvg(svg: SVGSVGElement): string {
  return `<?xml version="1.0" encoding="UTF-8"?>\n${new XMLSerializer().serializeToString(svg)}`;
}

function download(blob: Blob, filename: string): void {
  const url = URL.createObjectURL(blob);
  const a = document.createElement("a");
  a.href = url;
  a.download = filename;
  document.body.append(a);
  a.click();
  a.remove();
  setTimeout(() => URL.revokeObjectURL(url), 10_000);
}

export function downloadSvg(svg: SVGSVGElement, filename: string): void {
  download(new Blob([serializeSvg(svg)], { type: "image/svg+xml" }), filename);
}

/** Renders the SVG onto a canvas at twice its size and downloads the PNG. */
export async function downloadPng(svg: SVGSVGElement, filename: string, scale = 2): Promise<void> {
  const width = Number(svg.getAttribute("width"));
  const height = Number(svg.getAttribute("height"));
  const url = URL.createObjectURL(new Blob([serializeSvg(svg)], { type: "image/svg+xml" }));
  try {
    const image = new Image();
    await new Promise<void>((resolve, reject) => {
      image.onload = () => resolve();
      image.onerror = () => reject(new Error("The chart could not be drawn as an image."));
      image.src = url;
    });
    const canvas = document.createElement("canvas");
    canvas.width = Math.round(width * scale);
    canvas.height = Math.round(height * scale);
    const ctx = canvas.getContext("2d");
    if (!ctx) throw new Error("This browser cannot draw on a canvas.");
    ctx.fillStyle = "#ffffff";
    ctx.fillRect(0, 0, canvas.width, canvas.height);
    ctx.drawImage(image, 0, 0, canvas.width, canvas.height);
    const blob = await new Promise<Blob | null>((resolve) => canvas.toBlob(resolve, "image/png"));
    if (!blob) throw new Error("The PNG could not be made.");
    download(blob, filename);
  } finally {
    URL.revokeObjectURL(url);
  }
}
