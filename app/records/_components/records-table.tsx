"use client";

import Link from "next/link";
import { useRouter, useSearchParams } from "next/navigation";
import { memo, useCallback, useEffect, useMemo, useRef, useState, type FormEvent, type KeyboardEvent as ReactKeyboardEvent, type MouseEvent as ReactMouseEvent } from "react";
import { flexRender, getCoreRowModel, useReactTable, type ColumnDef, type Row, type RowData, type VisibilityState } from "@tanstack/react-table";
import { useVirtualizer } from "@tanstack/react-virtual";
import { OUTCOMES } from "@/lib/domain/outcomes";
import { RECORD_STATUSES } from "@/lib/schemas/record";
import { RECORD_SORT_KEYS, type RecordRangeKey } from "@/lib/schemas/records-query";
import { Button, ButtonLink } from "../../_components/button";
import { EmptyState } from "../../_components/empty-state";
import { formatDateTime, formatNumber } from "../../_components/format";
import { OutcomeLabel, outcomeText } from "../../_components/outcome-label";
import { outcomeColour } from "../../_components/palette";
import { StatusBadge, statusLabel } from "../../_components/status-badge";
import type { ApiErrorBody, RecordFacets, RecordsApiPage, RecordsApiRow } from "../_lib/api-types";
import { PAGE_SIZES, RANGE_PARAM_NAMES, queryStringOf, rangeParamOf, tableStateFromParams, type RangeParam, type TableState } from "../_lib/records-url";

declare module "@tanstack/react-table" {
  // eslint-disable-next-line @typescript-eslint/no-unused-vars
  interface ColumnMeta<TData extends RowData, TValue> {
    /** Header text without the unit. */
    label: string;
    /** Canonical unit shown in the header. */
    unit?: string;
    /** Minimum width in px; the source column also grows. */
    width: number;
    grow?: boolean;
    numeric?: boolean;
    sortable?: boolean;
  }
}

type ApiError = ApiErrorBody["error"];

const ROW_HEIGHT = 36;
const COLUMNS_STORAGE_KEY = "meltledger.records.columns.v1";
const DEFAULT_HIDDEN: VisibilityState = { spotDiameterUm: false, location: false, machine: false, updatedAt: false };
const SORTABLE = new Set<string>(RECORD_SORT_KEYS);

const RANGE_LABEL: Record<RangeParam, { label: string; unit: string }> = {
  power: { label: "Laser power", unit: "W" },
  speed: { label: "Scan speed", unit: "mm/s" },
  hatch: { label: "Hatch spacing", unit: "µm" },
  layer: { label: "Layer thickness", unit: "µm" },
  spot: { label: "Spot diameter (1/e²)", unit: "µm" },
  ev: { label: "Volumetric energy E_v", unit: "J/mm³" },
  density: { label: "Relative density", unit: "%" },
};
/** Ranges offered in the sidebar (spot diameter is rarely filtered; it stays available by URL). */
const RANGES_SHOWN: RangeParam[] = ["power", "speed", "hatch", "layer", "ev", "density"];

const num = (digits: number) => (v: unknown) => formatNumber(typeof v === "number" ? v : null, digits);

const COLUMNS: ColumnDef<RecordsApiRow>[] = [
  { id: "id", accessorKey: "id", header: "Record", meta: { label: "Record", width: 72, numeric: true, sortable: true }, cell: (c) => <Link href={`/records/${c.row.original.id}`}>#{c.row.original.id}</Link>, enableHiding: false },
  { id: "alloyKey", accessorKey: "alloyKey", header: "Alloy", meta: { label: "Alloy", width: 100, sortable: true } },
  { id: "sourceId", accessorKey: "sourceLabel", header: "Source", meta: { label: "Source", width: 170, grow: true, sortable: true }, cell: (c) => <span title={c.row.original.sourceLabel}>{c.row.original.sourceLabel}</span> },
  { id: "laserPowerW", accessorKey: "laserPowerW", header: "Power", meta: { label: "Power", unit: "W", width: 72, numeric: true, sortable: true }, cell: (c) => num(1)(c.getValue()) },
  { id: "scanSpeedMmPerS", accessorKey: "scanSpeedMmPerS", header: "Speed", meta: { label: "Speed", unit: "mm/s", width: 80, numeric: true, sortable: true }, cell: (c) => num(1)(c.getValue()) },
  { id: "hatchSpacingUm", accessorKey: "hatchSpacingUm", header: "Hatch", meta: { label: "Hatch", unit: "µm", width: 68, numeric: true, sortable: true }, cell: (c) => num(1)(c.getValue()) },
  { id: "layerThicknessUm", accessorKey: "layerThicknessUm", header: "Layer", meta: { label: "Layer", unit: "µm", width: 66, numeric: true, sortable: true }, cell: (c) => num(1)(c.getValue()) },
  { id: "spotDiameterUm", accessorKey: "spotDiameterUm", header: "Spot", meta: { label: "Spot 1/e²", unit: "µm", width: 80, numeric: true, sortable: true }, cell: (c) => num(1)(c.getValue()) },
  { id: "volumetricEnergyJMm3", accessorKey: "volumetricEnergyJMm3", header: "E_v", meta: { label: "E_v", unit: "J/mm³", width: 78, numeric: true, sortable: true }, cell: (c) => num(1)(c.getValue()) },
  { id: "relativeDensityPct", accessorKey: "relativeDensityPct", header: "Density", meta: { label: "Density", unit: "%", width: 78, numeric: true, sortable: true }, cell: (c) => num(2)(c.getValue()) },
  { id: "outcome", accessorKey: "outcome", header: "Outcome", meta: { label: "Outcome", width: 132, sortable: true }, cell: (c) => <OutcomeLabel outcome={c.row.original.outcome} /> },
  { id: "status", accessorKey: "status", header: "Status", meta: { label: "Status", width: 136, sortable: true }, cell: (c) => <StatusBadge status={c.row.original.status} /> },
  { id: "location", accessorFn: (r) => [r.locationLabel, r.locationPage ? `p. ${r.locationPage}` : null].filter(Boolean).join(", "), header: "Location", meta: { label: "Location", width: 120 } },
  { id: "machine", accessorKey: "machine", header: "Machine", meta: { label: "Machine", width: 140 }, cell: (c) => (c.getValue() as string | null) ?? "—" },
  { id: "qualityScore", accessorKey: "qualityScore", header: "Quality", meta: { label: "Quality", width: 80, numeric: true, sortable: true }, cell: (c) => num(2)(c.getValue()) },
  { id: "updatedAt", accessorKey: "updatedAt", header: "Updated", meta: { label: "Updated", width: 160, sortable: true }, cell: (c) => formatDateTime(c.row.original.updatedAt) },
];

function hasFilters(s: TableState): boolean {
  return Boolean(s.alloy.length || s.sourceId.length || s.status.length || s.outcome.length || s.search || Object.values(s.ranges).some((r) => r && (r.min || r.max)));
}

type Drafts = { search: string; ranges: Record<RangeParam, { min: string; max: string }> };

function draftsOf(s: TableState): Drafts {
  const ranges = Object.fromEntries(RANGE_PARAM_NAMES.map((n) => [n, { min: s.ranges[n]?.min ?? "", max: s.ranges[n]?.max ?? "" }])) as Drafts["ranges"];
  return { search: s.search, ranges };
}

function withDrafts(s: TableState, d: Drafts): TableState {
  const ranges: TableState["ranges"] = {};
  for (const n of RANGE_PARAM_NAMES) {
    const r = d.ranges[n];
    if (r.min.trim() || r.max.trim()) ranges[n] = { min: r.min.trim(), max: r.max.trim() };
  }
  return { ...s, search: d.search.trim(), ranges };
}

function toggle(list: readonly string[], value: string, on: boolean): string[] {
  return on ? [...new Set([...list, value])] : list.filter((v) => v !== value);
}

export interface RecordsTableProps {
  facets: RecordFacets;
  /** The page the server rendered for `initialKey` (the query string), or null when refused. */
  initialPage: RecordsApiPage | null;
  initialError: ApiError | null;
  initialKey: string;
}

/**
 * The records table: server-side filtering, sorting and paging through /api/records; the
 * address bar holds the state (shareable, back button works); rows are virtualized.
 */
export function RecordsTable({ facets, initialPage, initialError, initialKey }: RecordsTableProps) {
  const router = useRouter();
  const searchParams = useSearchParams();
  // The address bar is the source of truth; the local copy makes a click show at once
  // (the router updates search params a moment after pushState) and follows back/forward.
  const urlState = useMemo(() => tableStateFromParams(searchParams), [searchParams]);
  const urlKey = useMemo(() => queryStringOf(urlState), [urlState]);
  const [state, setState] = useState(urlState);
  // follow the URL only when its meaning changes, not on every new params object
  useEffect(() => setState(urlState), [urlKey]);
  const key = useMemo(() => queryStringOf(state), [state]);

  const [loaded, setLoaded] = useState<{ key: string; page: RecordsApiPage | null; error: ApiError | null }>({ key: initialKey, page: initialPage, error: initialError });
  const [loading, setLoading] = useState(false);

  // ---- data: fetch whenever the query in the address bar changes
  useEffect(() => {
    if (key === loaded.key) return;
    const controller = new AbortController();
    setLoading(true);
    fetch(`/api/records${key ? `?${key}` : ""}`, { signal: controller.signal, headers: { Accept: "application/json" } })
      .then(async (res) => {
        const body = (await res.json()) as RecordsApiPage | ApiErrorBody;
        if ("error" in body) setLoaded({ key, page: null, error: body.error });
        else setLoaded({ key, page: body, error: null });
      })
      .catch((e: unknown) => {
        if ((e as { name?: string }).name === "AbortError") return;
        setLoaded({ key, page: null, error: { code: "unavailable", message: "Could not reach the server. Check that it is running, then try again." } });
      })
      .finally(() => {
        if (!controller.signal.aborted) setLoading(false);
      });
    return () => controller.abort();
    // loaded.key is read on purpose without being a dependency: only a new query starts a fetch
  }, [key]);

  const navigate = useCallback((next: TableState) => {
    const qs = queryStringOf(next);
    setState(next);
    window.history.pushState(null, "", qs ? `?${qs}` : window.location.pathname);
  }, []);

  const setFilter = useCallback((patch: Partial<TableState>) => navigate({ ...state, ...patch, page: 0 }), [navigate, state]);

  // ---- drafts of the text filters, applied after a pause or on Enter
  const [drafts, setDrafts] = useState<Drafts>(() => draftsOf(state));
  const appliedKey = useRef(key);
  useEffect(() => {
    if (appliedKey.current !== key) {
      appliedKey.current = key;
      setDrafts(draftsOf(state));
    }
  }, [key, state]);
  const draftState = useMemo(() => withDrafts(state, drafts), [state, drafts]);
  const draftKey = queryStringOf(draftState);
  useEffect(() => {
    if (draftKey === key) return;
    const t = window.setTimeout(() => navigate({ ...draftState, page: 0 }), 450);
    return () => window.clearTimeout(t);
  }, [draftKey, key, draftState, navigate]);

  function applyDrafts(e: FormEvent) {
    e.preventDefault();
    if (draftKey !== key) navigate({ ...draftState, page: 0 });
  }

  // ---- columns shown, remembered in this browser
  const [columnVisibility, setColumnVisibility] = useState<VisibilityState>(DEFAULT_HIDDEN);
  useEffect(() => {
    try {
      const stored = window.localStorage.getItem(COLUMNS_STORAGE_KEY);
      if (stored) setColumnVisibility({ ...DEFAULT_HIDDEN, ...(JSON.parse(stored) as VisibilityState) });
    } catch {
      // unreadable or blocked storage: keep the defaults
    }
  }, []);
  /** Saved only when the user changes the choice, so loading never overwrites what was stored. */
  const changeColumnVisibility = useCallback((update: VisibilityState | ((old: VisibilityState) => VisibilityState)) => {
    setColumnVisibility((old) => {
      const next = typeof update === "function" ? update(old) : update;
      try {
        window.localStorage.setItem(COLUMNS_STORAGE_KEY, JSON.stringify(next));
      } catch {
        // storage full or blocked: the choice lasts for this visit only
      }
      return next;
    });
  }, []);

  const page = loaded.page;
  const rows = useMemo(() => page?.rows ?? [], [page]);
  const total = page?.total ?? 0;

  const table = useReactTable({
    data: rows,
    columns: COLUMNS,
    getCoreRowModel: getCoreRowModel(),
    getRowId: (r) => String(r.id),
    manualSorting: true,
    manualPagination: true,
    manualFiltering: true,
    rowCount: total,
    state: { columnVisibility, sorting: [{ id: state.sort, desc: state.direction === "desc" }] },
    onColumnVisibilityChange: changeColumnVisibility,
  });

  const visibleColumns = table.getVisibleLeafColumns();
  const template = visibleColumns.map((c) => (c.columnDef.meta?.grow ? `minmax(${c.columnDef.meta.width}px, 1fr)` : `${c.columnDef.meta?.width ?? 100}px`)).join(" ");
  const minWidth = visibleColumns.reduce((s, c) => s + (c.columnDef.meta?.width ?? 100), 0);

  // ---- virtual rows
  const scrollRef = useRef<HTMLDivElement>(null);
  // the body's virtualizer needs the element itself: a ref is attached only after children's effects ran
  const [scrollElement, setScrollElement] = useState<HTMLDivElement | null>(null);
  const attachScroller = useCallback((el: HTMLDivElement | null) => {
    scrollRef.current = el;
    setScrollElement(el);
  }, []);
  useEffect(() => {
    scrollRef.current?.scrollTo({ top: 0 });
  }, [loaded.key]);

  function sortBy(id: string) {
    if (!SORTABLE.has(id)) return;
    const direction = state.sort === id && state.direction === "asc" ? "desc" : "asc";
    navigate({ ...state, sort: id, direction, page: 0 });
  }

  const onRowClick = useCallback(
    (e: ReactMouseEvent<HTMLDivElement>, id: number) => {
      if ((e.target as HTMLElement).closest("a, button")) return;
      if (window.getSelection()?.toString()) return;
      router.push(`/records/${id}`);
    },
    [router],
  );

  // ---- errors of the query, by field (ranges.laserPowerW -> power)
  const rangeErrors: Partial<Record<RangeParam, string>> = {};
  const fieldErrors = (loaded.error?.details?.fieldErrors ?? {}) as Record<string, string[]>;
  for (const [k, messages] of Object.entries(fieldErrors)) {
    const [head, rangeKey] = k.split(".");
    if (head === "ranges" && rangeKey) {
      const p = rangeParamOf(rangeKey as RecordRangeKey);
      if (p) rangeErrors[p] = messages[0];
    }
  }

  const pageCount = Math.max(1, Math.ceil(total / state.pageSize));
  const first = total === 0 ? 0 : state.page * state.pageSize + 1;
  const last = Math.min(total, (state.page + 1) * state.pageSize);
  const filtered = hasFilters(state);
  const alloyChoices = [...new Set([...facets.alloys, ...state.alloy])];
  const sourceChoices = [...facets.sources, ...state.sourceId.filter((id) => !facets.sources.some((s) => String(s.id) === id)).map((id) => ({ id: Number(id), label: `Source #${id}` }))];

  return (
    <div className="records-layout">
      <form className="panel filters" onSubmit={applyDrafts} aria-label="Filters" role="search">
        <div className="field">
          <label className="field__label" htmlFor="filter-search">
            Search
          </label>
          <input id="filter-search" className="input" type="search" value={drafts.search} onChange={(e) => setDrafts((d) => ({ ...d, search: e.target.value }))} aria-describedby="filter-search-hint" autoComplete="off" />
          <span className="field__hint" id="filter-search-hint">
            Record number, alloy, machine or location
          </span>
        </div>

        <CheckGroup legend="Status" values={RECORD_STATUSES.map((s) => ({ value: s, label: statusLabel(s) }))} selected={state.status} onChange={(v, on) => setFilter({ status: toggle(state.status, v, on) })} />
        <CheckGroup
          legend="Outcome"
          values={OUTCOMES.map((o) => ({ value: o, label: outcomeText(o), swatch: outcomeColour(o) }))}
          selected={state.outcome}
          onChange={(v, on) => setFilter({ outcome: toggle(state.outcome, v, on) })}
        />
        <CheckGroup legend="Alloy" values={alloyChoices.map((a) => ({ value: a, label: a }))} selected={state.alloy} onChange={(v, on) => setFilter({ alloy: toggle(state.alloy, v, on) })} empty="No alloys yet" />
        <CheckGroup legend="Source" values={sourceChoices.map((s) => ({ value: String(s.id), label: s.label }))} selected={state.sourceId} onChange={(v, on) => setFilter({ sourceId: toggle(state.sourceId, v, on) })} empty="No sources yet" />

        {RANGES_SHOWN.map((n) => (
          <fieldset className="fieldset" key={n}>
            <legend>
              {RANGE_LABEL[n].label} <span className="muted" style={{ fontWeight: 400 }}>({RANGE_LABEL[n].unit})</span>
            </legend>
            <div className="range-pair">
              {(["min", "max"] as const).map((end) => (
                <input
                  key={end}
                  className="input"
                  inputMode="decimal"
                  autoComplete="off"
                  placeholder={end}
                  aria-label={`${RANGE_LABEL[n].label} ${end === "min" ? "minimum" : "maximum"} (${RANGE_LABEL[n].unit})`}
                  aria-invalid={rangeErrors[n] ? true : undefined}
                  aria-describedby={rangeErrors[n] ? `range-${n}-error` : undefined}
                  value={drafts.ranges[n][end]}
                  onChange={(e) => setDrafts((d) => ({ ...d, ranges: { ...d.ranges, [n]: { ...d.ranges[n], [end]: e.target.value } } }))}
                />
              ))}
            </div>
            {rangeErrors[n] ? (
              <p className="field__error" id={`range-${n}-error`}>
                {rangeErrors[n]}
              </p>
            ) : null}
          </fieldset>
        ))}

        <div style={{ display: "flex", gap: "0.5rem" }}>
          <Button type="submit" size="small">
            Apply
          </Button>
          {filtered ? (
            <Button size="small" variant="ghost" onClick={() => navigate({ ...state, alloy: [], sourceId: [], status: [], outcome: [], ranges: {}, search: "", page: 0 })}>
              Clear all filters
            </Button>
          ) : null}
        </div>
      </form>

      <div>
        <div className="table-status">
          <strong className="num" aria-live="polite">
            {page ? `${formatNumber(total, 0)} ${total === 1 ? "record" : "records"}${filtered ? " match" : ""}` : "—"}
          </strong>
          {loading ? (
            <span className="table-status__loading" role="status">
              <span className="spinner" aria-hidden="true" /> Loading…
            </span>
          ) : null}
          <span className="toolbar__spacer" />
          <label className="muted" htmlFor="page-size" style={{ fontSize: "0.9rem" }}>
            Rows per page
          </label>
          <select id="page-size" className="select" style={{ width: "auto", minHeight: "2rem" }} value={state.pageSize} onChange={(e) => navigate({ ...state, pageSize: Number(e.target.value), page: 0 })}>
            {PAGE_SIZES.map((n) => (
              <option key={n} value={n}>
                {n}
              </option>
            ))}
          </select>
          <ColumnMenu
            columns={table
              .getAllLeafColumns()
              .filter((c) => c.getCanHide())
              .map((c) => ({ id: c.id, label: `${c.columnDef.meta?.label ?? c.id}${c.columnDef.meta?.unit ? ` (${c.columnDef.meta.unit})` : ""}`, visible: c.getIsVisible(), toggle: (on: boolean) => c.toggleVisibility(on) }))}
            onReset={() => changeColumnVisibility(DEFAULT_HIDDEN)}
          />
          <ButtonLink href="/records/new" variant="primary" size="small">
            Key in a record
          </ButtonLink>
        </div>

        {loaded.error && !page ? (
          <div className="alert alert--error" role="alert">
            <p className="alert__title">{loaded.error.code === "invalid_input" ? "These filters cannot be applied" : "Could not load records"}</p>
            <p>{loaded.error.message}</p>
            {Object.entries(fieldErrors)
              .filter(([k]) => !k.startsWith("ranges."))
              .map(([k, m]) => (
                <p key={k}>
                  <span className="mono">{k}</span>: {m.join(" ")}
                </p>
              ))}
          </div>
        ) : null}

        {page && total === 0 ? (
          <div className="panel">
            {filtered ? (
              <EmptyState title="No records match these filters" actions={<Button onClick={() => navigate({ ...state, alloy: [], sourceId: [], status: [], outcome: [], ranges: {}, search: "", page: 0 })}>Clear all filters</Button>}>
                <p>Widen a range or untick a choice to see more.</p>
              </EmptyState>
            ) : (
              <EmptyState title="No build records yet" actions={<ButtonLink href="/records/new" variant="primary">Key in the first record</ButtonLink>}>
                <p>Records you key in appear here, with every value in its canonical unit.</p>
              </EmptyState>
            )}
          </div>
        ) : page ? (
          <div className="grid-table" style={{ opacity: loading ? 0.65 : 1, transition: "opacity 120ms" }}>
            <div ref={attachScroller} className="grid-table__scroller" role="table" aria-label="Build records" aria-rowcount={total + 1} aria-busy={loading || undefined} tabIndex={0}>
              <div role="rowgroup" style={{ minWidth }}>
                {table.getHeaderGroups().map((hg) => (
                  <div role="row" aria-rowindex={1} key={hg.id} className="grid-table__row grid-table__row--head" style={{ gridTemplateColumns: template, minWidth }}>
                    {hg.headers.map((h) => {
                      const meta = h.column.columnDef.meta;
                      const sortable = meta?.sortable && SORTABLE.has(h.column.id);
                      const active = state.sort === h.column.id;
                      return (
                        <div role="columnheader" key={h.id} className={`grid-table__cell${meta?.numeric ? " num" : ""}`} aria-sort={active ? (state.direction === "asc" ? "ascending" : "descending") : undefined}>
                          {sortable ? (
                            <button type="button" className="sort-button" onClick={() => sortBy(h.column.id)} title={`Sort by ${meta?.label ?? h.column.id}`}>
                              <span>
                                {meta?.label ?? flexRender(h.column.columnDef.header, h.getContext())}
                                {meta?.unit ? <span className="sort-button__unit"> ({meta.unit})</span> : null}
                              </span>
                              <SortIcon state={active ? state.direction : null} />
                            </button>
                          ) : (
                            <span>{meta?.label}</span>
                          )}
                        </div>
                      );
                    })}
                  </div>
                ))}
              </div>
              <VirtualRows rows={table.getRowModel().rows} scrollElement={scrollElement} template={template} minWidth={minWidth} firstRowIndex={state.page * state.pageSize + 2} onRowClick={onRowClick} />
            </div>
          </div>
        ) : null}

        {page && total > 0 ? (
          <nav className="pager" aria-label="Pages">
            <span className="num">
              Rows {formatNumber(first, 0)}–{formatNumber(last, 0)} of {formatNumber(total, 0)}
            </span>
            <span className="toolbar__spacer" />
            <Button size="small" disabled={state.page === 0} onClick={() => navigate({ ...state, page: 0 })}>
              First
            </Button>
            <Button size="small" disabled={state.page === 0} onClick={() => navigate({ ...state, page: state.page - 1 })}>
              Previous
            </Button>
            <span className="num muted">
              Page {formatNumber(state.page + 1, 0)} of {formatNumber(pageCount, 0)}
            </span>
            <Button size="small" disabled={state.page + 1 >= pageCount} onClick={() => navigate({ ...state, page: state.page + 1 })}>
              Next
            </Button>
            <Button size="small" disabled={state.page + 1 >= pageCount} onClick={() => navigate({ ...state, page: pageCount - 1 })}>
              Last
            </Button>
          </nav>
        ) : null}
      </div>
    </div>
  );
}

/**
 * The virtualized body: only the rows in view (plus a margin) are in the DOM, and scrolling
 * re-renders this component alone, not the filters and header around it.
 */
const VirtualRows = memo(function VirtualRows({ rows, scrollElement, template, minWidth, firstRowIndex, onRowClick }: { rows: Row<RecordsApiRow>[]; scrollElement: HTMLDivElement | null; template: string; minWidth: number; firstRowIndex: number; onRowClick: (e: ReactMouseEvent<HTMLDivElement>, id: number) => void }) {
  const virtualizer = useVirtualizer({ count: rows.length, getScrollElement: () => scrollElement, estimateSize: () => ROW_HEIGHT, overscan: 10 });
  const items = virtualizer.getVirtualItems();
  // Rows sit in normal flow inside one shifted block, so a row already on screen keeps its
  // props while scrolling and is not rendered again; only rows coming into view are.
  const offset = items[0]?.start ?? 0;
  return (
    <div role="rowgroup" className="grid-table__body" style={{ height: virtualizer.getTotalSize(), minWidth }}>
      <div style={{ transform: `translateY(${offset}px)` }}>
        {items.map((v) => {
          const row = rows[v.index];
          return row ? <VirtualRow key={row.id} row={row} template={template} minWidth={minWidth} rowIndex={firstRowIndex + v.index} onRowClick={onRowClick} /> : null;
        })}
      </div>
    </div>
  );
});

const VirtualRow = memo(function VirtualRow({ row, template, minWidth, rowIndex, onRowClick }: { row: Row<RecordsApiRow>; template: string; minWidth: number; rowIndex: number; onRowClick: (e: ReactMouseEvent<HTMLDivElement>, id: number) => void }) {
  return (
    <div role="row" aria-rowindex={rowIndex} className="grid-table__row" style={{ gridTemplateColumns: template, height: ROW_HEIGHT, minWidth, cursor: "pointer" }} onClick={(e) => onRowClick(e, row.original.id)}>
      {row.getVisibleCells().map((cell) => (
        <div role="cell" key={cell.id} className={`grid-table__cell${cell.column.columnDef.meta?.numeric ? " num" : ""}`}>
          {flexRender(cell.column.columnDef.cell, cell.getContext())}
        </div>
      ))}
    </div>
  );
});

function SortIcon({ state }: { state: "asc" | "desc" | null }) {
  return (
    <svg width="10" height="12" viewBox="0 0 10 12" aria-hidden="true" style={{ flex: "none" }}>
      <path d="M5 1 9 5H1z" fill={state === "asc" ? "currentColor" : "#b8bec6"} />
      <path d="M5 11 1 7h8z" fill={state === "desc" ? "currentColor" : "#b8bec6"} />
    </svg>
  );
}

function CheckGroup({ legend, values, selected, onChange, empty }: { legend: string; values: { value: string; label: string; swatch?: string }[]; selected: readonly string[]; onChange: (value: string, on: boolean) => void; empty?: string }) {
  const id = `filter-${legend.toLowerCase().replace(/\W+/g, "-")}`;
  return (
    <fieldset className="fieldset">
      <legend>
        {legend}
        {selected.length ? <span className="muted" style={{ fontWeight: 400 }}> · {selected.length} chosen</span> : null}
      </legend>
      {values.length === 0 ? (
        <p className="field__hint">{empty}</p>
      ) : (
        <div className="check-list">
          {values.map((v) => (
            <label className="checkbox" key={v.value} htmlFor={`${id}-${v.value}`}>
              <input type="checkbox" id={`${id}-${v.value}`} checked={selected.includes(v.value)} onChange={(e) => onChange(v.value, e.target.checked)} />
              <span>
                {v.swatch ? <span className="swatch" style={{ background: v.swatch }} aria-hidden="true" /> : null}
                {v.label}
              </span>
            </label>
          ))}
        </div>
      )}
    </fieldset>
  );
}

function ColumnMenu({ columns, onReset }: { columns: { id: string; label: string; visible: boolean; toggle: (on: boolean) => void }[]; onReset: () => void }) {
  const [open, setOpen] = useState(false);
  const ref = useRef<HTMLDivElement>(null);
  const buttonRef = useRef<HTMLButtonElement>(null);
  useEffect(() => {
    if (!open) return;
    const onDown = (e: MouseEvent) => {
      if (!ref.current?.contains(e.target as Node)) setOpen(false);
    };
    document.addEventListener("mousedown", onDown);
    return () => document.removeEventListener("mousedown", onDown);
  }, [open]);
  function onKeyDown(e: ReactKeyboardEvent) {
    if (e.key === "Escape" && open) {
      setOpen(false);
      buttonRef.current?.focus();
    }
  }
  return (
    <div className="column-menu" ref={ref} onKeyDown={onKeyDown}>
      <button ref={buttonRef} type="button" className="button button--small" aria-expanded={open} aria-controls="column-menu-panel" onClick={() => setOpen((o) => !o)}>
        Columns
      </button>
      {open ? (
        <div className="column-menu__panel" id="column-menu-panel" role="group" aria-label="Columns shown">
          {columns.map((c) => (
            <label className="checkbox" key={c.id} htmlFor={`col-${c.id}`}>
              <input type="checkbox" id={`col-${c.id}`} checked={c.visible} onChange={(e) => c.toggle(e.target.checked)} />
              <span>{c.label}</span>
            </label>
          ))}
          <Button size="small" variant="ghost" onClick={onReset}>
            Reset to default
          </Button>
        </div>
      ) : null}
    </div>
  );
}

