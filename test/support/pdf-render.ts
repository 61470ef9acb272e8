// Renders a PDF page in Node with pdf.js and its @napi-rs/canvas backend: the page's RGBA pixels,
// a PNG of it, and the mapping from PDF points (bottom-left origin) to the rendered pixels.
import path from "node:path";
import { createRequire } from "node:module";

export interface RenderedPage {
  width: number;
  height: number;
  data: Uint8ClampedArray;
  png: Buffer;
  /** Pixel position of a point given in PDF user space. */
  toPixel: (xPt: number, yPt: number) => { x: number; y: number };
}

interface NodeCanvas {
  toBuffer: (type: "image/png") => Buffer;
}

export async function renderPdfPage(pdf: Buffer, pageNumber: number, scale: number): Promise<RenderedPage> {
  const pdfjs = await import("pdfjs-dist/legacy/build/pdf.mjs");
  const fonts = path.join(path.dirname(createRequire(import.meta.url).resolve("pdfjs-dist/package.json")), "standard_fonts") + path.sep;
  const doc = await pdfjs.getDocument({ data: new Uint8Array(pdf), isEvalSupported: false, standardFontDataUrl: fonts }).promise;
  try {
    const page = await doc.getPage(pageNumber);
    const viewport = page.getViewport({ scale });
    const factory = (doc as unknown as { canvasFactory: { create: (w: number, h: number) => { canvas: unknown; context: CanvasRenderingContext2D } } }).canvasFactory;
    const width = Math.ceil(viewport.width);
    const height = Math.ceil(viewport.height);
    const { canvas, context } = factory.create(width, height);
    await page.render({ canvasContext: context, canvas: canvas as HTMLCanvasElement, viewport }).promise;
    const pixels = context.getImageData(0, 0, width, height);
    return {
      width,
      height,
      data: pixels.data,
      png: (canvas as NodeCanvas).toBuffer("image/png"),
      toPixel: (xPt, yPt) => {
        const [x, y] = viewport.convertToViewportPoint(xPt, yPt) as [number, number];
        return { x, y };
      },
    };
  } finally {
    await doc.destroy();
  }
}
