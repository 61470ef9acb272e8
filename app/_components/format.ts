/** Display formatting shared by pages; a fixed locale so server and browser print the same text. */

const LOCALE = "en-US";

/** A number with up to `digits` decimals and thousands separators; "—" for nothing. */
export function formatNumber(value: number | null | undefined, digits = 2): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return "—";
  return value.toLocaleString(LOCALE, { maximumFractionDigits: digits });
}

/** Three significant figures, for derived values such as energy densities. */
export function formatSignificant(value: number | null | undefined, figures = 3): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return "—";
  if (value === 0) return "0";
  const magnitude = Math.floor(Math.log10(Math.abs(value)));
  const digits = Math.max(0, figures - 1 - magnitude);
  return value.toLocaleString(LOCALE, { maximumFractionDigits: digits, minimumFractionDigits: 0 });
}

/** "2026-03-02 08:00 UTC": unambiguous and the same on every machine. */
export function formatDateTime(value: Date | string | null | undefined): string {
  if (value === null || value === undefined) return "—";
  const d = typeof value === "string" ? new Date(value) : value;
  if (Number.isNaN(d.getTime())) return String(value);
  return `${d.toISOString().slice(0, 16).replace("T", " ")} UTC`;
}

/** "3 records", "1 record". */
export function plural(count: number, one: string, many = `${one}s`): string {
  return `${count.toLocaleString(LOCALE)} ${count === 1 ? one : many}`;
}
