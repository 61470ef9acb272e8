// Row ids as the database stores them. Every id and version column is INTEGER: on PostgreSQL a
// 32-bit signed integer, at most 2,147,483,647 (PostgreSQL documentation, §8.1.1 Integer Types);
// SQLite would take larger ones, but no row of the PostgreSQL twin can have one, so a larger id
// names no row on either engine and is refused alike on both.
import { z } from "zod";

export const MAX_ROW_ID = 2_147_483_647;

/** True for a whole number from 1 to MAX_ROW_ID: an id some row could have. */
export function isRowId(n: unknown): n is number {
  return typeof n === "number" && Number.isInteger(n) && n >= 1 && n <= MAX_ROW_ID;
}

/** A positive whole number up to MAX_ROW_ID (ids, versions), coerced from text as forms send it. */
export const rowIdSchema = z.coerce
  .number()
  .int()
  .positive()
  .max(MAX_ROW_ID, { message: `Ids and versions are whole numbers up to ${MAX_ROW_ID.toLocaleString("en")}.` });
