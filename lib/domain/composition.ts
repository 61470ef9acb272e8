/**
 * Alloy compositions: parsing trade designations and element lists, filling the balance element,
 * checking the sum, and converting between weight and atomic percent.
 *
 * Trade convention (common practice): numbers are wt%, and the first element of a designation is the
 * balance, so `Ti-6Al-4V` is Al 6, V 4, Ti the remainder.
 */
import { getElement } from "./elements";

export type CompositionBasis = "wt" | "at";

/** One element of a composition; `amount` is in percent of `basis`. */
export interface CompositionComponent {
  element: string;
  amount: number;
  /** True for the element whose amount is the remainder to 100 %. */
  isBalance: boolean;
}

/** A complete composition: every amount filled, amounts summing to 100 ± the tolerance. */
export interface Composition {
  basis: CompositionBasis;
  components: CompositionComponent[];
}

export type CompositionResult = { ok: true; composition: Composition } | { ok: false; message: string };

/** A composition as written: the balance element has no amount yet. */
export interface CompositionDraft {
  basis: CompositionBasis;
  components: { element: string; amount: number | null; isBalance: boolean }[];
}

/** A composition must sum to 100 ± 0.5 % once the balance is filled (common practice). */
export const DEFAULT_SUM_TOLERANCE_PCT = 0.5;

export interface CompositionOptions {
  /** Allowed deviation of the sum from 100 %, in percentage points. */
  sumTolerancePct?: number;
}

const NUMBER = String.raw`\d+(?:\.\d+)?|\.\d+`;
const HYPHEN_TOKEN = new RegExp(String.raw`^(?:(${NUMBER})([A-Z][a-z]?)|([A-Z][a-z]?)(${NUMBER})?)$`);
const COMPACT_TOKEN = new RegExp(String.raw`([A-Z][a-z]?)(${NUMBER})?`, "y");
const LIST_ITEM = new RegExp(
  String.raw`([A-Za-z]{1,2})\s*[:=]?\s*\(?\s*(bal(?:ance)?\.?|rem(?:ainder)?\.?|base|${NUMBER})\s*\)?\s*(wt\.?\s*%|at\.?\s*%|%)?`,
  "iy",
);
const SEPARATOR = /[\s,;]*/y;

function checkSymbol(symbol: string, text: string): string | null {
  return getElement(symbol) ? null : `unknown element symbol '${symbol}' in '${text}'`;
}

/**
 * Parses a trade designation such as `Ti-6Al-4V`, `Fe-18Cr-8Ni`, `Ni-5Nb`, `AlSi10Mg` or
 * `TiAl6V4`. The first element is the balance. In the hyphen form the number precedes each symbol
 * (`-6Al`); in the compact form it follows it (`Si10`).
 *
 * @example
 * parseDesignation("Ti-6Al-4V");
 * // { ok: true, draft: { basis: "wt", components: [{element:"Ti",amount:null,isBalance:true}, {element:"Al",amount:6,...}, ...] } }
 */
export function parseDesignation(text: string): { ok: true; draft: CompositionDraft } | { ok: false; message: string } {
  const compact = text.replace(/\s+/g, "").replace(/[\u2010-\u2015\u2212]/g, "-");
  if (compact === "") return { ok: false, message: "empty composition" };
  const components: CompositionDraft["components"] = [];
  if (/-\d|-\.\d/.test(compact)) {
    const tokens = compact.split("-");
    const [first, ...rest] = tokens;
    if (first === undefined || !/^[A-Z][a-z]?$/.test(first)) {
      return { ok: false, message: `'${text}': a designation starts with the balance element, e.g. 'Ti-6Al-4V'` };
    }
    const bad = checkSymbol(first, text);
    if (bad) return { ok: false, message: bad };
    components.push({ element: first, amount: null, isBalance: true });
    for (const token of rest) {
      const m = HYPHEN_TOKEN.exec(token);
      if (!m) return { ok: false, message: `cannot read '${token}' in '${text}' (expected e.g. '6Al')` };
      const symbol = (m[2] ?? m[3]) as string;
      const amountText = m[1] ?? m[4];
      const err = checkSymbol(symbol, text);
      if (err) return { ok: false, message: err };
      if (amountText === undefined) {
        return { ok: false, message: `no amount given for ${symbol} in '${text}'` };
      }
      components.push({ element: symbol, amount: Number(amountText), isBalance: false });
    }
  } else {
    const body = compact.replace(/-/g, "");
    COMPACT_TOKEN.lastIndex = 0;
    let index = 0;
    while (index < body.length) {
      COMPACT_TOKEN.lastIndex = index;
      const m = COMPACT_TOKEN.exec(body);
      if (!m) return { ok: false, message: `cannot read '${text}' as a composition (expected e.g. 'Ti-6Al-4V' or 'Fe bal, Cr 17')` };
      index = COMPACT_TOKEN.lastIndex;
      const symbol = m[1] as string;
      const err = checkSymbol(symbol, text);
      if (err) return { ok: false, message: err };
      const isFirst = components.length === 0;
      if (isFirst) {
        if (m[2] !== undefined) {
          return { ok: false, message: `'${text}': the first element is the balance and takes no amount` };
        }
        components.push({ element: symbol, amount: null, isBalance: true });
      } else {
        if (m[2] === undefined) {
          return { ok: false, message: `no amount given for ${symbol} in '${text}'; write it as an element list, e.g. 'Al bal, Si 10, Mg 0.35'` };
        }
        components.push({ element: symbol, amount: Number(m[2]), isBalance: false });
      }
    }
    if (components.length < 2) {
      return { ok: false, message: `'${text}' names one element only; a composition needs at least two` };
    }
  }
  const dup = findDuplicate(components.map((c) => c.element));
  if (dup) return { ok: false, message: `${dup} appears twice in '${text}'` };
  return { ok: true, draft: { basis: "wt", components } };
}

/**
 * Parses an element list such as `Fe bal, Cr 17, Ni 12, Mo 2.5` (wt% unless every amount is marked
 * `at%`). `bal`, `balance`, `rem` or `base` marks the balance element; without one, every amount
 * must be given.
 *
 * @example
 * parseElementList("Fe bal, Cr 17, Ni 12, Mo 2.5").ok; // true
 * parseElementList("Ni 50 at%, Ti 50 at%"); // basis "at"
 */
export function parseElementList(text: string): { ok: true; draft: CompositionDraft } | { ok: false; message: string } {
  const components: CompositionDraft["components"] = [];
  const bases = new Set<CompositionBasis>();
  let index = 0;
  const trimmed = text.trim();
  while (index < trimmed.length) {
    SEPARATOR.lastIndex = index;
    SEPARATOR.exec(trimmed);
    index = SEPARATOR.lastIndex;
    if (index >= trimmed.length) break;
    LIST_ITEM.lastIndex = index;
    const m = LIST_ITEM.exec(trimmed);
    if (!m) {
      return { ok: false, message: `cannot read '${trimmed.slice(index)}' in '${text}' (expected e.g. 'Cr 17' or 'Fe bal')` };
    }
    index = LIST_ITEM.lastIndex;
    const rawSymbol = m[1] as string;
    const symbol = rawSymbol.charAt(0).toUpperCase() + rawSymbol.slice(1).toLowerCase();
    const err = checkSymbol(symbol, text);
    if (err) return { ok: false, message: err };
    const amountText = (m[2] as string).toLowerCase();
    const unit = m[3]?.toLowerCase().replace(/[\s.]/g, "");
    if (unit === "at%") bases.add("at");
    else if (unit !== undefined) bases.add("wt");
    if (/^\d|^\./.test(amountText)) {
      components.push({ element: symbol, amount: Number(amountText), isBalance: false });
    } else {
      components.push({ element: symbol, amount: null, isBalance: true });
    }
  }
  if (components.length === 0) return { ok: false, message: "empty composition" };
  if (bases.size > 1) return { ok: false, message: `'${text}' mixes wt% and at%` };
  if (components.filter((c) => c.isBalance).length > 1) {
    return { ok: false, message: `'${text}' has more than one balance element` };
  }
  const dup = findDuplicate(components.map((c) => c.element));
  if (dup) return { ok: false, message: `${dup} appears twice in '${text}'` };
  return { ok: true, draft: { basis: bases.has("at") ? "at" : "wt", components } };
}

function findDuplicate(items: string[]): string | null {
  const seen = new Set<string>();
  for (const item of items) {
    if (seen.has(item)) return item;
    seen.add(item);
  }
  return null;
}

/**
 * Fills the balance element and checks the amounts: each within 0–100, the sum 100 ± tolerance.
 *
 * @example
 * completeComposition({ basis: "wt", components: [
 *   { element: "Ti", amount: null, isBalance: true }, { element: "Al", amount: 6, isBalance: false },
 * ] }); // Ti 94, Al 6
 */
export function completeComposition(draft: CompositionDraft, options: CompositionOptions = {}): CompositionResult {
  const tolerance = options.sumTolerancePct ?? DEFAULT_SUM_TOLERANCE_PCT;
  const unit = draft.basis === "wt" ? "wt%" : "at%";
  let given = 0;
  for (const c of draft.components) {
    if (c.amount === null) continue;
    if (!Number.isFinite(c.amount) || c.amount < 0 || c.amount > 100) {
      return { ok: false, message: `${c.element} ${c.amount} ${unit} is outside 0–100` };
    }
    given += c.amount;
  }
  const balanceCount = draft.components.filter((c) => c.amount === null).length;
  if (balanceCount > 1) return { ok: false, message: "more than one element without an amount" };
  if (balanceCount === 1) {
    const remainder = roundPct(100 - given);
    if (remainder <= 0) {
      return { ok: false, message: `the given amounts sum to ${roundPct(given)} ${unit}, leaving nothing for the balance element` };
    }
    return {
      ok: true,
      composition: {
        basis: draft.basis,
        components: draft.components.map((c) => ({
          element: c.element,
          amount: c.amount ?? remainder,
          isBalance: c.amount === null,
        })),
      },
    };
  }
  if (Math.abs(given - 100) > tolerance) {
    return { ok: false, message: `amounts sum to ${roundPct(given)} ${unit}, not 100 ± ${tolerance}` };
  }
  return {
    ok: true,
    composition: {
      basis: draft.basis,
      components: draft.components.map((c) => ({ element: c.element, amount: c.amount as number, isBalance: false })),
    },
  };
}

/**
 * Parses either form (designation or element list), fills the balance and checks the sum.
 *
 * @example
 * parseComposition("Fe-18Cr-8Ni"); // Fe 74, Cr 18, Ni 8 (wt%)
 * parseComposition("Fe bal, Cr 17, Ni 12, Mo 2.5"); // Fe 68.5, ...
 * parseComposition("Fe-18Xx"); // { ok: false, message: "unknown element symbol 'Xx' in 'Fe-18Xx'" }
 */
export function parseComposition(text: string, options: CompositionOptions = {}): CompositionResult {
  const trimmed = text.trim();
  if (trimmed === "") return { ok: false, message: "empty composition" };
  const looksLikeList = /[,;]|\s|\bbal|\brem/i.test(trimmed) && !/^[A-Z][a-z]?(-\S+)+$/.test(trimmed);
  const parsed = looksLikeList ? parseElementList(trimmed) : parseDesignation(trimmed);
  if (!parsed.ok) return parsed;
  return completeComposition(parsed.draft, options);
}

function roundPct(value: number): number {
  return Math.round(value * 1e9) / 1e9;
}

function molarMassOf(symbol: string): number {
  const element = getElement(symbol);
  if (!element) throw new RangeError(`composition: unknown element '${symbol}'`);
  return element.atomicMassGPerMol;
}

/**
 * Mass and atomic fractions (each summing to 1) of a composition in either basis.
 * w_i = x_i·M_i / Σ x_j·M_j with standard atomic weights (CIAAW).
 *
 * @example
 * compositionFractions(ti64).find((f) => f.element === "Al")?.atomicFraction; // ≈ 0.102
 */
export function compositionFractions(
  composition: Composition,
): { element: string; massFraction: number; atomicFraction: number }[] {
  const total = composition.components.reduce((s, c) => s + c.amount, 0);
  if (!(total > 0)) throw new RangeError("compositionFractions: composition amounts sum to zero");
  if (composition.basis === "wt") {
    const moles = composition.components.map((c) => c.amount / total / molarMassOf(c.element));
    const sumMoles = moles.reduce((s, m) => s + m, 0);
    return composition.components.map((c, i) => ({
      element: c.element,
      massFraction: c.amount / total,
      atomicFraction: (moles[i] as number) / sumMoles,
    }));
  }
  const masses = composition.components.map((c) => (c.amount / total) * molarMassOf(c.element));
  const sumMasses = masses.reduce((s, m) => s + m, 0);
  return composition.components.map((c, i) => ({
    element: c.element,
    massFraction: (masses[i] as number) / sumMasses,
    atomicFraction: c.amount / total,
  }));
}

/**
 * Converts a composition to atomic percent (the balance flag is kept).
 *
 * @example
 * toAtomicPercent({ basis: "wt", components: [{ element: "Ti", amount: 90, isBalance: true }, ...] });
 */
export function toAtomicPercent(composition: Composition): Composition {
  if (composition.basis === "at") return composition;
  const fractions = compositionFractions(composition);
  return {
    basis: "at",
    components: composition.components.map((c, i) => ({
      element: c.element,
      amount: (fractions[i]?.atomicFraction ?? 0) * 100,
      isBalance: c.isBalance,
    })),
  };
}

/**
 * Converts a composition to weight percent (the balance flag is kept).
 *
 * @example
 * toWeightPercent({ basis: "at", components: [{ element: "Ni", amount: 50, isBalance: false }, { element: "Ti", amount: 50, isBalance: false }] });
 * // Ni ≈ 55.08 wt%, Ti ≈ 44.92 wt%
 */
export function toWeightPercent(composition: Composition): Composition {
  if (composition.basis === "wt") return composition;
  const fractions = compositionFractions(composition);
  return {
    basis: "wt",
    components: composition.components.map((c, i) => ({
      element: c.element,
      amount: (fractions[i]?.massFraction ?? 0) * 100,
      isBalance: c.isBalance,
    })),
  };
}

function roundForDesignation(amount: number): number {
  return Math.round(amount * 1e4) / 1e4;
}

/**
 * Writes a composition in the hyphen designation form: the balance (or the largest element) first,
 * the others by decreasing amount, e.g. `Fe-17Cr-12Ni-2.5Mo`.
 *
 * @example
 * formatDesignation(parseComposition("Fe bal, Cr 17, Ni 12, Mo 2.5").composition); // "Fe-17Cr-12Ni-2.5Mo"
 */
export function formatDesignation(composition: Composition): string {
  const components = [...composition.components];
  let baseIndex = components.findIndex((c) => c.isBalance);
  if (baseIndex < 0) {
    baseIndex = components.reduce((best, c, i) => (c.amount > (components[best]?.amount ?? -1) ? i : best), 0);
  }
  const [base] = components.splice(baseIndex, 1);
  if (!base) return "";
  // Sorted on the printed (rounded) amount so that formatting a re-parsed key gives the same key.
  components.sort(
    (a, b) => roundForDesignation(b.amount) - roundForDesignation(a.amount) || a.element.localeCompare(b.element),
  );
  const parts = [base.element, ...components.map((c) => `${roundForDesignation(c.amount)}${c.element}`)];
  return composition.basis === "at" ? `${parts.join("-")} (at%)` : parts.join("-");
}
