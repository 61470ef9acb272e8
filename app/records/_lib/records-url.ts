/**
 * The records table's state in the address bar and the API query string, so a filtered view
 * is shareable and the back button steps through filters.
 *
 * ?alloy=316L,IN718&sourceId=3&status=accepted&outcome=dense&power_min=100&power_max=300
 *  &ev_min=40&search=M-280&sort=laserPowerW&direction=desc&page=0&pageSize=100
 *
 * Lists are comma-separated (or repeated when a value itself holds a comma); ranges are
 * `<name>_min` / `<name>_max` in canonical units.
 */
import type { RecordRangeKey, RecordSortKey } from "@/lib/schemas/records-query";

/** Short URL names of the range filters and the canonical column each one filters. */
export const RANGE_PARAMS = {
  power: "laserPowerW",
  speed: "scanSpeedMmPerS",
  hatch: "hatchSpacingUm",
  layer: "layerThicknessUm",
  spot: "spotDiameterUm",
  ev: "volumetricEnergyJMm3",
  density: "relativeDensityPct",
} as const satisfies Record<string, RecordRangeKey>;

export type RangeParam = keyof typeof RANGE_PARAMS;
export const RANGE_PARAM_NAMES = Object.keys(RANGE_PARAMS) as RangeParam[];

const LIST_PARAMS = ["alloy", "sourceId", "status", "outcome"] as const;
type ListParam = (typeof LIST_PARAMS)[number];

export const DEFAULT_PAGE_SIZE = 100;
export const PAGE_SIZES = [50, 100, 250, 500, 1000] as const;

/** The table state as text, exactly as the URL holds it (validation is the schema's job). */
export interface TableState {
  alloy: string[];
  sourceId: string[];
  status: string[];
  outcome: string[];
  ranges: Partial<Record<RangeParam, { min: string; max: string }>>;
  search: string;
  sort: string;
  direction: "asc" | "desc";
  page: number;
  pageSize: number;
}

interface ParamsLike {
  get(name: string): string | null;
  getAll(name: string): string[];
}

function listOf(params: ParamsLike, name: ListParam): string[] {
  const all = params.getAll(name).filter((v) => v !== "");
  // a single value may be a comma list; repeated values are taken as they are
  const values = all.length === 1 ? (all[0] ?? "").split(",") : all;
  return values.map((v) => v.trim()).filter(Boolean);
}

function intOr(text: string | null, fallback: number): number {
  if (text === null || text.trim() === "") return fallback;
  const n = Number(text);
  return Number.isInteger(n) ? n : fallback;
}

/** Reads the table state from a query string; anything missing takes its default. */
export function tableStateFromParams(params: ParamsLike): TableState {
  const ranges: TableState["ranges"] = {};
  for (const name of RANGE_PARAM_NAMES) {
    const min = params.get(`${name}_min`)?.trim() ?? "";
    const max = params.get(`${name}_max`)?.trim() ?? "";
    if (min !== "" || max !== "") ranges[name] = { min, max };
  }
  return {
    alloy: listOf(params, "alloy"),
    sourceId: listOf(params, "sourceId"),
    status: listOf(params, "status"),
    outcome: listOf(params, "outcome"),
    ranges,
    search: params.get("search")?.trim() ?? "",
    sort: params.get("sort")?.trim() || "id",
    direction: params.get("direction") === "desc" ? "desc" : "asc",
    page: intOr(params.get("page"), 0),
    pageSize: intOr(params.get("pageSize"), DEFAULT_PAGE_SIZE),
  };
}

/** Writes the table state as a query string, leaving defaults out so URLs stay short. */
export function paramsFromTableState(s: TableState): URLSearchParams {
  const p = new URLSearchParams();
  for (const name of LIST_PARAMS) {
    const values = s[name];
    if (!values.length) continue;
    if (values.some((v) => v.includes(","))) for (const v of values) p.append(name, v);
    else p.set(name, values.join(","));
  }
  for (const name of RANGE_PARAM_NAMES) {
    const r = s.ranges[name];
    if (r?.min) p.set(`${name}_min`, r.min);
    if (r?.max) p.set(`${name}_max`, r.max);
  }
  if (s.search) p.set("search", s.search);
  if (s.sort !== "id") p.set("sort", s.sort);
  if (s.direction !== "asc") p.set("direction", s.direction);
  if (s.page !== 0) p.set("page", String(s.page));
  if (s.pageSize !== DEFAULT_PAGE_SIZE) p.set("pageSize", String(s.pageSize));
  return p;
}

/** The query string of a table state, with list commas left readable ("alloy=316L,IN718"). */
export function queryStringOf(s: TableState): string {
  return paramsFromTableState(s).toString().replace(/%2C/gi, ",");
}

/** The table state in the input shape of recordsQuerySchema (the schema coerces and checks it). */
export function queryInputFromTableState(s: TableState): Record<string, unknown> {
  const ranges: Record<string, { min: string | null; max: string | null }> = {};
  for (const name of RANGE_PARAM_NAMES) {
    const r = s.ranges[name];
    if (r && (r.min || r.max)) ranges[RANGE_PARAMS[name]] = { min: r.min || null, max: r.max || null };
  }
  return {
    alloy: s.alloy,
    sourceId: s.sourceId,
    status: s.status,
    outcome: s.outcome,
    ranges,
    search: s.search || undefined,
    sort: s.sort as RecordSortKey,
    direction: s.direction,
    page: s.page,
    pageSize: s.pageSize,
  };
}

/** Query string → recordsQuerySchema input, for the API route and the page. */
export function queryInputFromParams(params: ParamsLike): Record<string, unknown> {
  return queryInputFromTableState(tableStateFromParams(params));
}

/** A Next.js searchParams object as URLSearchParams. */
export function toURLSearchParams(record: Record<string, string | string[] | undefined>): URLSearchParams {
  const p = new URLSearchParams();
  for (const [k, v] of Object.entries(record)) {
    if (Array.isArray(v)) for (const x of v) p.append(k, x);
    else if (v !== undefined) p.set(k, v);
  }
  return p;
}

/** Names the schema's error paths ("ranges.laserPowerW") after the URL parameters ("power"). */
export function rangeParamOf(key: RecordRangeKey): RangeParam | undefined {
  return RANGE_PARAM_NAMES.find((n) => RANGE_PARAMS[n] === key);
}
