// Input checking and category handling shared by all agreement statistics.
// Ratings arrive from forms and the database as numbers or strings; numeric strings are
// treated as the number they spell ("2" and 2 and "2.0" are one category) because the
// same score may come back from different storage paths in different types.

import type { Category, Rating, RatingsMatrix } from "./types";

const NUMERIC = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;

/** Canonical identity of a rating or category label. */
export function categoryKey(value: Category): string {
  if (typeof value === "number") return String(value === 0 ? 0 : value);
  if (NUMERIC.test(value)) return String(Number(value) === 0 ? 0 : Number(value));
  return value;
}

function isNumericKey(key: string): boolean {
  return NUMERIC.test(key);
}

// Natural order for labels without a given order: digit runs compare as numbers so that
// "grade 2" sorts before "grade 10"; ties fall back to plain code-unit order so the
// result never depends on the runtime's locale.
export function naturalCompare(a: string, b: string): number {
  const pa = a.split(/(\d+)/);
  const pb = b.split(/(\d+)/);
  for (let i = 0; i < Math.min(pa.length, pb.length); i++) {
    const x = pa[i];
    const y = pb[i];
    if (x === y) continue;
    const digits = i % 2 === 1; // split with a capture group alternates text, digits
    if (digits) {
      const d = Number(x) - Number(y);
      if (d !== 0) return d;
    } else {
      const lx = x.toLowerCase();
      const ly = y.toLowerCase();
      if (lx !== ly) return lx < ly ? -1 : 1;
    }
    return x < y ? -1 : 1;
  }
  return pa.length - pb.length || (a < b ? -1 : a > b ? 1 : 0);
}

/** Throws unless the matrix is an array of equally long rows of number | string | null. */
export function checkShape(matrix: RatingsMatrix, fn: string): { units: number; raters: number } {
  if (!Array.isArray(matrix)) throw new TypeError(`${fn}: the ratings matrix must be an array of rows`);
  let raters = -1;
  matrix.forEach((row, i) => {
    if (!Array.isArray(row)) throw new TypeError(`${fn}: row ${i} is not an array`);
    if (raters === -1) raters = row.length;
    else if (row.length !== raters) throw new Error(`${fn}: ragged matrix, row ${i} has ${row.length} ratings but row 0 has ${raters}`);
    row.forEach((cell: unknown, j) => {
      if (cell === null) return;
      if (typeof cell === "number" && Number.isFinite(cell)) return;
      if (typeof cell === "string" && cell.trim() !== "") return;
      throw new TypeError(`${fn}: rating at row ${i}, column ${j} must be a finite number, a non-empty string or null (got ${String(cell)})`);
    });
  });
  return { units: matrix.length, raters: Math.max(raters, 0) };
}

export interface PreparedMatrix {
  units: number;
  raters: number;
  /** Category keys in order (given order, else numeric, else natural). */
  keys: string[];
  /** Whether the order came from the caller. */
  orderGiven: boolean;
  /** Category index per cell, null for a missing rating. */
  codes: (number | null)[][];
}

/** Validates the matrix and codes every rating as an index into the ordered category list. */
export function prepareMatrix(matrix: RatingsMatrix, fn: string, categories?: readonly Category[]): PreparedMatrix {
  const { units, raters } = checkShape(matrix, fn);
  let keys: string[];
  if (categories !== undefined) {
    if (!Array.isArray(categories)) throw new TypeError(`${fn}: categories must be an array`);
    keys = categories.map((c) => {
      if (!((typeof c === "number" && Number.isFinite(c)) || (typeof c === "string" && c.trim() !== "")))
        throw new TypeError(`${fn}: category ${String(c)} must be a finite number or a non-empty string`);
      return categoryKey(c);
    });
    if (new Set(keys).size !== keys.length) throw new Error(`${fn}: categories contain a duplicate`);
  } else {
    const seen = new Set<string>();
    for (const row of matrix) for (const cell of row) if (cell !== null) seen.add(categoryKey(cell));
    keys = [...seen];
    if (keys.every(isNumericKey)) keys.sort((a, b) => Number(a) - Number(b));
    else keys.sort(naturalCompare);
  }
  const index = new Map(keys.map((k, i) => [k, i] as const));
  const codes = matrix.map((row, i) =>
    row.map((cell: Rating, j) => {
      if (cell === null) return null;
      const code = index.get(categoryKey(cell));
      if (code === undefined) throw new Error(`${fn}: rating ${String(cell)} at row ${i}, column ${j} is not among the given categories`);
      return code;
    }),
  );
  return { units, raters, keys, orderGiven: categories !== undefined, codes };
}

/** Per-unit category counts (r_ik) and totals (r_i) from a prepared matrix. */
export function unitCounts(p: PreparedMatrix): { counts: number[][]; totals: number[] } {
  const q = p.keys.length;
  const counts = p.codes.map((row) => {
    const c = new Array<number>(q).fill(0);
    for (const code of row) if (code !== null) c[code] += 1;
    return c;
  });
  const totals = counts.map((c) => c.reduce((s, x) => s + x, 0));
  return { counts, totals };
}

/**
 * Numeric value of each category for interval/ratio metrics: the number itself when every
 * category is numeric, else its 1-based rank in the given order (equal spacing assumed).
 */
export function categoryValues(p: PreparedMatrix, fn: string): number[] {
  if (p.keys.every(isNumericKey)) return p.keys.map(Number);
  if (p.orderGiven) return p.keys.map((_, i) => i + 1);
  throw new Error(`${fn}: interval and ratio levels need numeric ratings or an ordered categories list`);
}
