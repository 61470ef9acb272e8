"use client";

import { useEffect, useMemo, useRef, useState, type PointerEvent as ReactPointerEvent } from "react";
import { calibrateFigure, readPoint, type AxisScale, type PixelPoint } from "@/lib/domain/figure-calibration";
import { FIGURE_QUANTITY_FIELDS, type FigureQuantityField } from "@/lib/domain/figure-records";
import { detectMarkers } from "@/lib/domain/marker-detection";
import { OUTCOMES, outcomeLabel, type Outcome } from "@/lib/domain/outcomes";
import { quantityLabel, unitOptions } from "@/lib/domain/units";
import { RECORD_QUANTITY_FIELDS } from "@/lib/schemas/record";
import { Button } from "../../_components/button";
import { loadPdfjs, type PdfDocumentRef } from "../../_components/pdf-pane";
import "./figure-reader.css";

export interface FigureSourceOption {
  id: number;
  label: string;
}

type Tool = "x-ticks" | "y-ticks" | "add" | "detect";
interface Tick {
  pixel: PixelPoint | null;
  value: string;
}
interface AxisState {
  field: FigureQuantityField;
  unit: string;
  scale: AxisScale;
  ticks: [Tick, Tick];
}
interface Kind {
  id: string;
  outcome: Outcome;
  legend: string;
}
interface Point {
  key: number;
  pixel: PixelPoint;
  kind: string;
  detected: boolean;
}
interface ApiError {
  message: string;
  details?: { pointErrors?: { point: number; message: string }[]; rowErrors?: { row: number; field: string; message: string }[]; fieldErrors?: Record<string, string[]> };
}

const KIND_COLOURS = ["#d81b60", "#1e63d6", "#2e7d32", "#ef6c00", "#6a1b9a"];

const unitsOf = (f: FigureQuantityField) => unitOptions(RECORD_QUANTITY_FIELDS[f]);
const labelOf = (f: FigureQuantityField) => quantityLabel(RECORD_QUANTITY_FIELDS[f]);
const newAxis = (field: FigureQuantityField, scale: AxisScale = "linear"): AxisState => ({ field, unit: unitsOf(field)[0]!.id, scale, ticks: [{ pixel: null, value: "" }, { pixel: null, value: "" }] });
const numberOf = (s: string) => (s.trim() === "" ? Number.NaN : Number(s.replace(",", ".")));

/**
 * Reads a process plot into records: a source's PDF page or an uploaded PNG/JPEG is shown at its
 * pixel size; two ticks per axis calibrate it; points are clicked or found from one clicked marker;
 * every point is drawn over the figure, can be dragged or removed, and is previewed and committed
 * through the same checks as any record. Nothing is written before "Write records".
 */
export function FigureReader({
  sources,
  initialSourceId,
  initialDocumentId = null,
  initialPage = null,
}: {
  sources: readonly FigureSourceOption[];
  initialSourceId: number | null;
  /** From the PDF pane's "Read a figure": the paper and page to show at once. */
  initialDocumentId?: number | null;
  initialPage?: number | null;
}) {
  const [sourceId, setSourceId] = useState<number | null>(initialSourceId);
  const [documents, setDocuments] = useState<PdfDocumentRef[]>([]);
  const [documentId, setDocumentId] = useState<number | null>(null);
  const [pageInput, setPageInput] = useState(String(initialPage ?? 1));
  const [autoShow, setAutoShow] = useState(initialDocumentId !== null);
  const [page, setPage] = useState<number | null>(null);
  const [imageName, setImageName] = useState<string | null>(null);
  const [size, setSize] = useState<{ width: number; height: number } | null>(null);
  const [loadMessage, setLoadMessage] = useState<string | null>(null);
  const [tool, setTool] = useState<Tool>("x-ticks");
  const [x, setX] = useState<AxisState>(newAxis("laserPower"));
  const [y, setY] = useState<AxisState>(newAxis("scanSpeed"));
  const [nextTick, setNextTick] = useState<{ x: 0 | 1; y: 0 | 1 }>({ x: 0, y: 0 });
  const [figureLabel, setFigureLabel] = useState("Fig. 1");
  const [alloy, setAlloy] = useState("");
  const [fixed, setFixed] = useState<Partial<Record<FigureQuantityField, { value: string; unit: string }>>>({});
  const [kinds, setKinds] = useState<Kind[]>([{ id: "kind-1", outcome: "dense", legend: "" }]);
  const [activeKind, setActiveKind] = useState("kind-1");
  const [points, setPoints] = useState<Point[]>([]);
  const [dragging, setDragging] = useState<number | null>(null);
  const [message, setMessage] = useState<{ tone: "error" | "info" | "success"; text: string; list?: string[] } | null>(null);
  const [preview, setPreview] = useState<Record<string, unknown>[] | null>(null);
  const [busy, setBusy] = useState(false);
  const canvasRef = useRef<HTMLCanvasElement>(null);
  const keyRef = useRef(1);

  useEffect(() => {
    setDocuments([]);
    setDocumentId(null);
    if (!sourceId) return;
    let cancelled = false;
    fetch(`/api/sources/${sourceId}/documents`)
      .then((r) => (r.ok ? (r.json() as Promise<{ documents: PdfDocumentRef[] }>) : { documents: [] }))
      .then((b) => {
        if (cancelled) return;
        setDocuments(b.documents);
        setDocumentId(b.documents.find((d) => d.id === initialDocumentId)?.id ?? b.documents[0]?.id ?? null);
      })
      .catch(() => undefined);
    return () => {
      cancelled = true;
    };
  }, [sourceId, initialDocumentId]);

  useEffect(() => {
    if (!autoShow || documentId === null || documentId !== initialDocumentId) return;
    setAutoShow(false);
    void showPdfPage();
    // showPdfPage reads the current document and page input; it runs once, for the link's page
  }, [autoShow, documentId, initialDocumentId]);

  function resetReading(width: number, height: number) {
    setSize({ width, height });
    setPoints([]);
    setPreview(null);
    setMessage(null);
    setX((a) => ({ ...a, ticks: [{ ...a.ticks[0], pixel: null }, { ...a.ticks[1], pixel: null }] }));
    setY((a) => ({ ...a, ticks: [{ ...a.ticks[0], pixel: null }, { ...a.ticks[1], pixel: null }] }));
    setNextTick({ x: 0, y: 0 });
    setTool("x-ticks");
  }

  async function showPdfPage() {
    if (!documentId) return;
    setLoadMessage(null);
    try {
      const pdfjs = await loadPdfjs();
      const doc = await pdfjs.getDocument({ url: `/api/documents/${documentId}` }).promise;
      const n = Math.min(Math.max(1, Math.round(Number(pageInput) || 1)), doc.numPages);
      const pdfPage = await doc.getPage(n);
      // twice the page's point size: markers of a few points become patches of many pixels
      const viewport = pdfPage.getViewport({ scale: 2 });
      const canvas = canvasRef.current!;
      canvas.width = Math.ceil(viewport.width);
      canvas.height = Math.ceil(viewport.height);
      await pdfPage.render({ canvasContext: canvas.getContext("2d", { willReadFrequently: true })!, canvas, viewport }).promise;
      await doc.destroy();
      setPage(n);
      setPageInput(String(n));
      setImageName(null);
      resetReading(canvas.width, canvas.height);
    } catch (error) {
      setLoadMessage(`The page could not be shown: ${(error as Error).message}`);
    }
  }

  async function showImage(file: File) {
    setLoadMessage(null);
    if (!["image/png", "image/jpeg"].includes(file.type)) {
      setLoadMessage(`"${file.name}" is not a PNG or JPEG image.`);
      return;
    }
    try {
      const bitmap = await createImageBitmap(file);
      const canvas = canvasRef.current!;
      canvas.width = bitmap.width;
      canvas.height = bitmap.height;
      canvas.getContext("2d", { willReadFrequently: true })!.drawImage(bitmap, 0, 0);
      bitmap.close();
      setImageName(file.name);
      setPage(null);
      resetReading(canvas.width, canvas.height);
    } catch {
      setLoadMessage(`"${file.name}" could not be read as an image.`);
    }
  }

  const calibration = useMemo(() => {
    const axisInput = (a: AxisState, which: "x" | "y") => ({
      scale: a.scale,
      ticks: a.ticks.map((t) => ({ pixel: t.pixel ? (which === "x" ? t.pixel.x : t.pixel.y) : Number.NaN, value: numberOf(t.value) })) as [{ pixel: number; value: number }, { pixel: number; value: number }],
    });
    return { input: { x: axisInput(x, "x"), y: axisInput(y, "y") }, result: calibrateFigure({ x: axisInput(x, "x"), y: axisInput(y, "y") }) };
  }, [x, y]);

  function pixelOf(e: ReactPointerEvent<Element>): PixelPoint {
    const canvas = canvasRef.current!;
    const rect = canvas.getBoundingClientRect();
    return { x: ((e.clientX - rect.left) * canvas.width) / rect.width, y: ((e.clientY - rect.top) * canvas.height) / rect.height };
  }

  function onFigurePointer(e: ReactPointerEvent<SVGSVGElement>) {
    if (!size) return;
    const p = pixelOf(e);
    setPreview(null);
    if (tool === "x-ticks" || tool === "y-ticks") {
      const which = tool === "x-ticks" ? "x" : "y";
      const i = nextTick[which];
      (which === "x" ? setX : setY)((a) => {
        const ticks: [Tick, Tick] = [...a.ticks];
        ticks[i] = { ...ticks[i], pixel: p };
        return { ...a, ticks };
      });
      setNextTick((n) => ({ ...n, [which]: i === 0 ? 1 : 0 }));
      return;
    }
    if (tool === "add") {
      setPoints((ps) => [...ps, { key: keyRef.current++, pixel: p, kind: activeKind, detected: false }]);
      return;
    }
    const canvas = canvasRef.current!;
    const data = canvas.getContext("2d", { willReadFrequently: true })!.getImageData(0, 0, canvas.width, canvas.height);
    const found = detectMarkers({ data: data.data, width: data.width, height: data.height }, p);
    if (!found.ok) {
      setMessage({ tone: "error", text: found.message });
      return;
    }
    setPoints((ps) => {
      // a marker already placed (within half its size) is not added twice
      const near = (q: PixelPoint) => ps.some((o) => Math.hypot(o.pixel.x - q.x, o.pixel.y - q.y) < Math.max(2, found.seed.widthPx / 2));
      const fresh = found.markers.filter((m) => !near(m)).map((m) => ({ key: keyRef.current++, pixel: { x: m.x, y: m.y }, kind: activeKind, detected: true }));
      setMessage({ tone: "info", text: `Found ${found.markers.length} markers like the one clicked (${fresh.length} new). Check them on the figure; drag or remove any that are wrong.` });
      return [...ps, ...fresh];
    });
  }

  function body(dryRun: boolean) {
    const { input } = calibration;
    return {
      sourceId,
      page,
      figureLabel,
      alloy,
      axes: { x: { field: x.field, unit: x.unit, scale: x.scale, ticks: input.x.ticks }, y: { field: y.field, unit: y.unit, scale: y.scale, ticks: input.y.ticks } },
      // a quantity moved onto an axis keeps no fixed value
      fixed: Object.fromEntries(Object.entries(fixed).filter(([f, v]) => v && v.value.trim() !== "" && f !== x.field && f !== y.field)),
      kinds: kinds.map((k) => ({ id: k.id, outcome: k.outcome, legend: k.legend || outcomeLabel(k.outcome) })),
      // a detected centroid is placed to about a pixel; a click to about two (common practice, from memory)
      points: points.map((p) => ({ pixel: p.pixel, kind: p.kind, pixelUncertaintyPx: p.detected ? 1 : 2 })),
      dryRun,
    };
  }

  async function send(dryRun: boolean) {
    if (!calibration.result.ok) {
      setMessage({ tone: "error", text: "The axes are not calibrated yet.", list: calibration.result.problems.map((p) => p.message) });
      return;
    }
    setBusy(true);
    try {
      const res = await fetch("/api/figures", { method: "POST", headers: { "Content-Type": "application/json" }, body: JSON.stringify(body(dryRun)) });
      const json = (await res.json()) as { ids?: number[]; records?: Record<string, unknown>[]; error?: ApiError };
      if (!res.ok || json.error) {
        const d = json.error?.details;
        const list = [
          ...(d?.pointErrors ?? []).map((p) => p.message),
          ...(d?.rowErrors ?? []).map((r) => `Point ${r.row}: ${r.field}: ${r.message}`),
          ...Object.entries(d?.fieldErrors ?? {}).flatMap(([k, v]) => v.map((m) => `${k}: ${m}`)),
        ];
        setMessage({ tone: "error", text: json.error?.message ?? "The figure could not be read.", list });
        setPreview(null);
        return;
      }
      if (dryRun) {
        setPreview(json.records ?? []);
        setMessage({ tone: "info", text: `${json.records?.length ?? 0} records would be written. Nothing is written until you choose "Write records".` });
      } else {
        setPreview(null);
        setPoints([]);
        setMessage({ tone: "success", text: `Wrote ${json.ids?.length ?? 0} records from ${figureLabel}.` });
      }
    } finally {
      setBusy(false);
    }
  }

  const kindColour = (id: string) => KIND_COLOURS[Math.max(0, kinds.findIndex((k) => k.id === id)) % KIND_COLOURS.length]!;
  const markR = size ? Math.max(4, size.width / 160) : 4;

  function axisFields(label: string, a: AxisState, set: (f: (a: AxisState) => AxisState) => void, which: "x" | "y") {
    return (
      <fieldset className="fieldset figure-reader__axis">
        <legend>{label}</legend>
        <label className="field">
          <span className="field__label">Quantity</span>
          <select className="select" aria-label={`${which} axis quantity`} value={a.field} onChange={(e) => set(() => ({ ...newAxis(e.target.value as FigureQuantityField, a.scale), ticks: a.ticks }))}>
            {FIGURE_QUANTITY_FIELDS.map((f) => (
              <option key={f} value={f}>
                {labelOf(f)}
              </option>
            ))}
          </select>
        </label>
        <label className="field">
          <span className="field__label">Unit</span>
          <select className="select" aria-label={`${which} axis unit`} value={a.unit} onChange={(e) => set((s) => ({ ...s, unit: e.target.value }))}>
            {unitsOf(a.field).map((u) => (
              <option key={u.id} value={u.id}>
                {u.label}
              </option>
            ))}
          </select>
        </label>
        <label className="field">
          <span className="field__label">Scale</span>
          <select className="select" aria-label={`${which} axis scale`} value={a.scale} onChange={(e) => set((s) => ({ ...s, scale: e.target.value as AxisScale }))}>
            <option value="linear">linear</option>
            <option value="log">log</option>
          </select>
        </label>
        {a.ticks.map((t, i) => (
          <label className="field" key={i}>
            <span className="field__label">
              Tick {i + 1} value {t.pixel ? <span className="muted">(marked)</span> : <span className="muted">(not marked)</span>}
            </span>
            <input
              className="input"
              inputMode="decimal"
              aria-label={`${which} tick ${i + 1} value`}
              value={t.value}
              onChange={(e) =>
                set((s) => {
                  const ticks: [Tick, Tick] = [...s.ticks];
                  ticks[i] = { ...ticks[i]!, value: e.target.value };
                  return { ...s, ticks };
                })
              }
            />
          </label>
        ))}
      </fieldset>
    );
  }

  const calibrated = calibration.result.ok ? calibration.result.calibration : null;
  const readings = calibrated ? points.map((p) => readPoint(calibrated, p.pixel)) : [];

  return (
    <div className="figure-reader">
      <section className="panel figure-reader__setup" aria-label="Figure setup">
        <div className="figure-reader__row">
          <label className="field">
            <span className="field__label">Source</span>
            <select className="select" aria-label="Source" value={sourceId ?? ""} onChange={(e) => setSourceId(Number(e.target.value) || null)}>
              <option value="">Choose a source…</option>
              {sources.map((s) => (
                <option key={s.id} value={s.id}>
                  {s.label}
                </option>
              ))}
            </select>
          </label>
          {documents.length ? (
            <>
              <label className="field">
                <span className="field__label">Paper</span>
                <select className="select" aria-label="Paper" value={documentId ?? ""} onChange={(e) => setDocumentId(Number(e.target.value))}>
                  {documents.map((d) => (
                    <option key={d.id} value={d.id}>
                      {d.fileName}
                    </option>
                  ))}
                </select>
              </label>
              <label className="field figure-reader__page">
                <span className="field__label">Page</span>
                <input className="input" inputMode="numeric" aria-label="Page" value={pageInput} onChange={(e) => setPageInput(e.target.value)} />
              </label>
              <Button onClick={() => void showPdfPage()}>Show page</Button>
            </>
          ) : null}
          <label className="field">
            <span className="field__label">Or an image (PNG, JPEG)</span>
            <input id="figure-image" className="input" type="file" accept="image/png,image/jpeg" onChange={(e) => e.target.files?.[0] && void showImage(e.target.files[0])} />
          </label>
        </div>
        {loadMessage ? <p className="alert alert--error" role="alert">{loadMessage}</p> : null}
        <div className="figure-reader__row">
          <label className="field">
            <span className="field__label">Figure label</span>
            <input className="input" aria-label="Figure label" value={figureLabel} onChange={(e) => setFigureLabel(e.target.value)} />
          </label>
          <label className="field">
            <span className="field__label">Alloy</span>
            <input className="input" aria-label="Alloy" value={alloy} onChange={(e) => setAlloy(e.target.value)} placeholder="316L" />
          </label>
          {FIGURE_QUANTITY_FIELDS.filter((f) => f !== x.field && f !== y.field).map((f) => (
            <label className="field" key={f}>
              <span className="field__label">
                Fixed {labelOf(f)} <span className="field__optional">(optional)</span>
              </span>
              <span className="figure-reader__value">
                <input className="input" inputMode="decimal" aria-label={`Fixed ${labelOf(f)}`} value={fixed[f]?.value ?? ""} onChange={(e) => setFixed((s) => ({ ...s, [f]: { value: e.target.value, unit: s[f]?.unit ?? unitsOf(f)[0]!.id } }))} />
                <select className="select" aria-label={`Fixed ${labelOf(f)} unit`} value={fixed[f]?.unit ?? unitsOf(f)[0]!.id} onChange={(e) => setFixed((s) => ({ ...s, [f]: { value: s[f]?.value ?? "", unit: e.target.value } }))}>
                  {unitsOf(f).map((u) => (
                    <option key={u.id} value={u.id}>
                      {u.label}
                    </option>
                  ))}
                </select>
              </span>
            </label>
          ))}
        </div>
        <div className="figure-reader__row">
          {axisFields("Horizontal axis", x, setX, "x")}
          {axisFields("Vertical axis", y, setY, "y")}
        </div>
        <fieldset className="fieldset">
          <legend>Marker kinds</legend>
          {kinds.map((k, i) => (
            <div className="figure-reader__kind" key={k.id}>
              <input type="radio" name="active-kind" aria-label={`Place kind ${i + 1}`} checked={activeKind === k.id} onChange={() => setActiveKind(k.id)} />
              <span className="figure-reader__swatch" style={{ background: kindColour(k.id) }} aria-hidden />
              <select className="select" aria-label={`Kind ${i + 1} outcome`} value={k.outcome} onChange={(e) => setKinds((ks) => ks.map((o) => (o.id === k.id ? { ...o, outcome: e.target.value as Outcome } : o)))}>
                {OUTCOMES.map((o) => (
                  <option key={o} value={o}>
                    {outcomeLabel(o)}
                  </option>
                ))}
              </select>
              <input className="input" aria-label={`Kind ${i + 1} legend`} placeholder="as the legend says, e.g. red squares" value={k.legend} onChange={(e) => setKinds((ks) => ks.map((o) => (o.id === k.id ? { ...o, legend: e.target.value } : o)))} />
            </div>
          ))}
          <Button
            size="small"
            onClick={() => {
              const id = `kind-${kinds.length + 1}`;
              setKinds((ks) => [...ks, { id, outcome: "keyhole", legend: "" }]);
              setActiveKind(id);
            }}
            disabled={kinds.length >= KIND_COLOURS.length}
          >
            Add a marker kind
          </Button>
        </fieldset>
      </section>

      <section className="panel figure-reader__figure" aria-label="Figure">
        <div className="figure-reader__tools" role="radiogroup" aria-label="Tool">
          {(
            [
              ["x-ticks", `Mark x ticks (next: ${nextTick.x + 1})`],
              ["y-ticks", `Mark y ticks (next: ${nextTick.y + 1})`],
              ["add", "Add points"],
              ["detect", "Find markers like a clicked one"],
            ] as const
          ).map(([t, label]) => (
            <Button key={t} size="small" variant={tool === t ? "primary" : "secondary"} aria-pressed={tool === t} onClick={() => setTool(t)} disabled={!size}>
              {label}
            </Button>
          ))}
          <span className="toolbar__spacer" />
          <span className="muted" role="status">
            {points.length} points
          </span>
          <Button size="small" variant="ghost" onClick={() => setPoints([])} disabled={!points.length}>
            Clear points
          </Button>
        </div>
        {!size ? <p className="muted">Show a PDF page or choose an image to start.</p> : null}
        <div className="figure-reader__stage" hidden={!size}>
          <canvas ref={canvasRef} className="figure-reader__canvas" aria-label={imageName ? `Image ${imageName}` : page ? `Page ${page}` : "Figure"} />
          {size ? (
            <svg
              className="figure-reader__overlay"
              viewBox={`0 0 ${size.width} ${size.height}`}
              data-testid="figure-overlay"
              onPointerDown={(e) => {
                if (dragging === null) onFigurePointer(e);
              }}
              onPointerMove={(e) => {
                if (dragging === null) return;
                const p = pixelOf(e);
                setPoints((ps) => ps.map((o) => (o.key === dragging ? { ...o, pixel: p, detected: false } : o)));
              }}
              onPointerUp={() => setDragging(null)}
            >
              {(["x", "y"] as const).flatMap((which) =>
                (which === "x" ? x : y).ticks.map((t, i) =>
                  t.pixel ? (
                    <g key={`${which}${i}`} className="figure-reader__tick">
                      <line x1={which === "x" ? t.pixel.x : 0} x2={which === "x" ? t.pixel.x : size.width} y1={which === "x" ? 0 : t.pixel.y} y2={which === "x" ? size.height : t.pixel.y} />
                      <text x={t.pixel.x + 6} y={t.pixel.y - 6}>
                        {which}
                        {i + 1} = {t.value || "?"}
                      </text>
                    </g>
                  ) : null,
                ),
              )}
              {points.map((p, i) => (
                <circle
                  key={p.key}
                  className="figure-reader__point"
                  data-point={i + 1}
                  cx={p.pixel.x}
                  cy={p.pixel.y}
                  r={markR}
                  style={{ stroke: kindColour(p.kind) }}
                  onPointerDown={(e) => {
                    e.stopPropagation();
                    e.currentTarget.ownerSVGElement?.setPointerCapture(e.pointerId);
                    setDragging(p.key);
                  }}
                />
              ))}
            </svg>
          ) : null}
        </div>
      </section>

      <section className="panel" aria-label="Points">
        {message ? (
          <div className={`alert alert--${message.tone}`} role={message.tone === "error" ? "alert" : "status"}>
            <p>{message.text}</p>
            {message.list?.length ? (
              <ul>
                {message.list.slice(0, 20).map((m, i) => (
                  <li key={i}>{m}</li>
                ))}
              </ul>
            ) : null}
          </div>
        ) : null}
        {!calibration.result.ok && size ? (
          <ul className="muted figure-reader__problems" aria-label="Calibration">
            {calibration.result.problems.map((p) => (
              <li key={p.axis}>{p.message}</li>
            ))}
          </ul>
        ) : null}
        {points.length ? (
          <div className="table-wrap">
            <table className="table" aria-label="Read points">
              <thead>
                <tr>
                  <th>#</th>
                  <th>Kind</th>
                  <th>Pixel</th>
                  <th>{labelOf(x.field)} ({x.unit})</th>
                  <th>{labelOf(y.field)} ({y.unit})</th>
                  <th />
                </tr>
              </thead>
              <tbody>
                {points.map((p, i) => {
                  const r = readings[i];
                  return (
                    <tr key={p.key}>
                      <td className="num">{i + 1}</td>
                      <td>
                        <select className="select" aria-label={`Point ${i + 1} kind`} value={p.kind} onChange={(e) => setPoints((ps) => ps.map((o) => (o.key === p.key ? { ...o, kind: e.target.value } : o)))}>
                          {kinds.map((k, j) => (
                            <option key={k.id} value={k.id}>
                              {j + 1}: {outcomeLabel(k.outcome)}
                            </option>
                          ))}
                        </select>
                      </td>
                      <td className="num">
                        {Math.round(p.pixel.x)}, {Math.round(p.pixel.y)}
                      </td>
                      {r ? (
                        r.ok ? (
                          <>
                            <td className="num">{r.point.value.x.toPrecision(4)}</td>
                            <td className="num">{r.point.value.y.toPrecision(4)}</td>
                          </>
                        ) : (
                          <td colSpan={2} className="field__error">
                            outside the marked axes
                          </td>
                        )
                      ) : (
                        <td colSpan={2} className="muted">
                          axes not calibrated
                        </td>
                      )}
                      <td>
                        <Button size="small" variant="ghost" aria-label={`Remove point ${i + 1}`} onClick={() => setPoints((ps) => ps.filter((o) => o.key !== p.key))}>
                          Remove
                        </Button>
                      </td>
                    </tr>
                  );
                })}
              </tbody>
            </table>
          </div>
        ) : null}
        {preview ? (
          <div className="table-wrap">
            <table className="table" aria-label="Records to write">
              <thead>
                <tr>
                  <th>{labelOf(x.field)}</th>
                  <th>{labelOf(y.field)}</th>
                  <th>Outcome</th>
                  <th>Location</th>
                </tr>
              </thead>
              <tbody>
                {preview.map((rec, i) => (
                  <tr key={i}>
                    <td className="num">{(rec[x.field] as { value: string }).value} {x.unit}</td>
                    <td className="num">{(rec[y.field] as { value: string }).value} {y.unit}</td>
                    <td>{outcomeLabel(rec.outcome as Outcome)}</td>
                    <td className="mono">{String(rec.locationLabel)}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        ) : null}
        <div className="form-actions">
          <Button onClick={() => void send(true)} disabled={busy || !points.length || !sourceId}>
            Preview records
          </Button>
          <Button variant="primary" onClick={() => void send(false)} disabled={busy || !points.length || !sourceId}>
            Write records
          </Button>
        </div>
      </section>
    </div>
  );
}
