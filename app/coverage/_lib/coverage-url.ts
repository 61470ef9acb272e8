/**
 * The coverage view's filters in the address bar and the API query string: the names of the
 * shared schema (lib/schemas/coverage.ts), values as typed ("80-120um"), so a view can be shared.
 */

export const COVERAGE_PARAMS = [
  "alloy", "status", "hatch", "layer", "spot", "power", "speed", "k", "powerBins", "speedBins", "powerScale", "speedScale", "windowHatch", "windowLayer", "windowSpot",
] as const;
export type CoverageParam = (typeof COVERAGE_PARAMS)[number];

/** The filters as text, exactly as the URL holds them (validation is the schema's job). */
export type CoverageFilters = Record<CoverageParam, string>;

export const EMPTY_FILTERS: CoverageFilters = Object.fromEntries(COVERAGE_PARAMS.map((p) => [p, ""])) as CoverageFilters;

/** Filters from a page's search params; unknown names are ignored. */
export function filtersFromParams(params: Record<string, string | string[] | undefined> | URLSearchParams): CoverageFilters {
  const get = (name: string): string => {
    if (params instanceof URLSearchParams) return params.getAll(name).join(",");
    const v = params[name];
    return Array.isArray(v) ? v.join(",") : (v ?? "");
  };
  return Object.fromEntries(COVERAGE_PARAMS.map((p) => [p, get(p).trim()])) as CoverageFilters;
}

/** The non-empty filters as a query string, in a fixed order. */
export function queryStringOf(filters: CoverageFilters): string {
  const q = new URLSearchParams();
  for (const p of COVERAGE_PARAMS) if (filters[p]) q.set(p, filters[p]);
  return q.toString().replace(/%2C/gi, ",");
}

/** The input the coverage schema reads: the filters that are set. */
export function queryInputOf(filters: CoverageFilters): Record<string, string> {
  return Object.fromEntries(COVERAGE_PARAMS.filter((p) => filters[p]).map((p) => [p, filters[p]]));
}
