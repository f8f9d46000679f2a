// Input checking and category handling shared by all agreement statistics.
// Ratings arrive from forms and the database as numbers or strings; numeric strings are
// treated as the number they spell ("2" and 2 and "2.0" are one category) because the
// same score may come back from different storage paths in different types.

import type { Category, RatingsMatrix } from "./types";

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

/**
 * Checks the optional multiplicity list: one non-negative whole number per row, the
 * number of identical units that row stands for. Returns null when absent.
 */
export function checkMultiplicity(multiplicity: readonly number[] | undefined, rows: number, fn: string): readonly number[] | null {
  if (multiplicity === undefined) return null;
  if (!Array.isArray(multiplicity)) throw new TypeError(`${fn}: multiplicity must be an array with one count per row`);
  if (multiplicity.length !== rows) throw new Error(`${fn}: multiplicity has ${multiplicity.length} entries but the matrix has ${rows} rows`);
  for (let i = 0; i < rows; i++) {
    const w: unknown = multiplicity[i];
    if (typeof w !== "number" || !Number.isSafeInteger(w) || w < 0)
      throw new RangeError(`${fn}: multiplicity of row ${i} must be a whole number ≥ 0 (got ${String(w)})`);
  }
  return multiplicity;
}

// Whole numbers 0 ≤ x < SMALL are cached in an array rather than a map.
const SMALL = 256;

function badCell(fn: string, cell: unknown, i: number, j: number): TypeError {
  return new TypeError(`${fn}: rating at row ${i}, column ${j} must be a finite number, a non-empty string or null (got ${String(cell)})`);
}

function isValidCell(cell: unknown): cell is number | string {
  return (typeof cell === "number" && Number.isFinite(cell)) || (typeof cell === "string" && cell.trim() !== "");
}

export interface CodedMatrix {
  /** Rows given. */
  rows: number;
  /** Units the rows stand for: the sum of the multiplicities (= rows without them). */
  units: number;
  raters: number;
  /** Category keys in order (given order, else numeric, else natural). */
  keys: string[];
  /** Whether the order came from the caller. */
  orderGiven: boolean;
  /** Category index per cell, row-major (rows × raters); −1 for a missing rating and for every cell of a row with multiplicity 0. */
  codes: Int32Array;
  /** Multiplicity per row; null when every row is one unit. */
  weights: readonly number[] | null;
}

/**
 * Validates the matrix (and multiplicities) and codes every rating as an index into the
 * ordered category list, in one pass with a cache per distinct raw value. Rows of
 * multiplicity 0 are checked but add no category, exactly as if they were absent.
 */
export function codeMatrix(matrix: RatingsMatrix, fn: string, categories?: readonly Category[], multiplicity?: readonly number[]): CodedMatrix {
  if (!Array.isArray(matrix)) throw new TypeError(`${fn}: the ratings matrix must be an array of rows`);
  const rows = matrix.length;
  const weights = checkMultiplicity(multiplicity, rows, fn);
  let raters = 0;
  for (let i = 0; i < rows; i++) {
    const row: unknown = matrix[i];
    if (!Array.isArray(row)) throw new TypeError(`${fn}: row ${i} is not an array`);
    if (i === 0) raters = row.length;
    else if (row.length !== raters) throw new Error(`${fn}: ragged matrix, row ${i} has ${row.length} ratings but row 0 has ${raters}`);
  }
  const orderGiven = categories !== undefined;
  // Category key → index: final indexes when the order is given, else first-seen
  // indexes that are renumbered once all keys are known.
  const index = new Map<string, number>();
  let keys: string[] = [];
  if (orderGiven) {
    if (!Array.isArray(categories)) throw new TypeError(`${fn}: categories must be an array`);
    keys = categories.map((c) => {
      if (!isValidCell(c)) throw new TypeError(`${fn}: category ${String(c)} must be a finite number or a non-empty string`);
      return categoryKey(c);
    });
    keys.forEach((k, i) => index.set(k, i));
    if (index.size !== keys.length) throw new Error(`${fn}: categories contain a duplicate`);
  }
  const unknown = (cell: number | string, i: number, j: number) =>
    new Error(`${fn}: rating ${String(cell)} at row ${i}, column ${j} is not among the given categories`);
  const cache = new Map<number | string, number>();
  const smallCache = new Int32Array(SMALL).fill(-1);
  const codes = new Int32Array(rows * raters);
  let units = 0;
  for (let i = 0; i < rows; i++) {
    const row = matrix[i];
    const o = i * raters;
    const w = weights === null ? 1 : weights[i];
    units += w;
    if (w === 0) {
      for (let j = 0; j < raters; j++) {
        const cell: unknown = row[j];
        codes[o + j] = -1;
        if (cell === null) continue;
        if (!isValidCell(cell)) throw badCell(fn, cell, i, j);
        if (orderGiven && !index.has(categoryKey(cell))) throw unknown(cell, i, j);
      }
      continue;
    }
    for (let j = 0; j < raters; j++) {
      const cell: unknown = row[j];
      if (cell === null) {
        codes[o + j] = -1;
        continue;
      }
      // Small whole numbers (the usual score codes) are looked up in an array, anything
      // else in a map; either way a raw value is checked and keyed only once.
      const small = typeof cell === "number" && cell >= 0 && cell < SMALL && Number.isInteger(cell);
      let code = small ? smallCache[cell as number] : (cache.get(cell as number | string) ?? -1);
      if (code < 0) {
        if (!isValidCell(cell)) throw badCell(fn, cell, i, j);
        const key = categoryKey(cell);
        code = index.get(key) ?? -1;
        if (code < 0) {
          if (orderGiven) throw unknown(cell, i, j);
          code = keys.length;
          keys.push(key);
          index.set(key, code);
        }
        if (small) smallCache[cell as number] = code;
        else cache.set(cell, code);
      }
      codes[o + j] = code;
    }
  }
  if (!orderGiven && keys.length > 0) {
    const sorted = [...keys];
    if (sorted.every(isNumericKey)) sorted.sort((a, b) => Number(a) - Number(b));
    else sorted.sort(naturalCompare);
    const renumber = new Int32Array(keys.length);
    sorted.forEach((k, i) => (renumber[index.get(k)!] = i));
    for (let c = 0; c < codes.length; c++) if (codes[c] >= 0) codes[c] = renumber[codes[c]];
    keys = sorted;
  }
  return { rows, units, raters, keys, orderGiven, codes, weights };
}

/**
 * Units grouped by their vector of category counts (r_ik): the statistics other than
 * Cohen's kappa depend on a unit only through that vector, so every computation runs
 * once per distinct vector, weighted by how many units share it.
 */
export interface UnitGroups {
  /** Distinct count vectors (length q each) of units with at least one rating. */
  counts: number[][];
  /** Ratings per group (r_i). */
  totals: number[];
  /** Units per group. */
  weights: number[];
}

// Count vectors are keyed by Σ_k r_ik·B^k with B = raters + 1 while that stays an exact
// integer; beyond that (many categories) by their text.
const EXACT = 2 ** 52;

/**
 * Groups the units of a coded matrix by count vector. The order of the groups is fixed
 * by the vectors alone (ascending in r_iq, then r_i(q−1), …), never by row order, so a
 * matrix and the same units given as grouped rows with multiplicities yield the same
 * groups in the same order — and the same sums, bit for bit, and the same bootstrap.
 */
export function groupUnits(m: CodedMatrix): UnitGroups {
  const q = m.keys.length;
  const R = m.raters;
  const B = R + 1;
  const counts: number[][] = [];
  const totals: number[] = [];
  const weights: number[] = [];
  if (q === 0 || m.rows === 0) return { counts, totals, weights };
  const { codes } = m;
  if (Math.pow(B, q) <= EXACT) {
    const pow = new Float64Array(q);
    for (let k = 0, p = 1; k < q; k++, p *= B) pow[k] = p;
    const space = Math.pow(B, q);
    // Few possible vectors for many rows: tally in an array indexed by key (already in
    // key order); else in a map whose keys are sorted afterwards.
    const dense = space <= 1 << 20 && space <= 4 * m.rows + 4096 ? new Float64Array(space) : null;
    const byKey = new Map<number, number>();
    for (let i = 0, o = 0; i < m.rows; i++, o += R) {
      let key = 0;
      for (let j = 0; j < R; j++) {
        const c = codes[o + j];
        if (c >= 0) key += pow[c];
      }
      if (key === 0) continue;
      const w = m.weights === null ? 1 : m.weights[i];
      if (dense) dense[key] += w;
      else byKey.set(key, (byKey.get(key) ?? 0) + w);
    }
    let sorted: number[];
    if (dense) {
      sorted = [];
      for (let key = 1; key < space; key++) {
        if (dense[key] === 0) continue;
        sorted.push(key);
        byKey.set(key, dense[key]);
      }
    } else sorted = [...byKey.keys()].sort((a, b) => a - b);
    for (const key of sorted) {
      const c = new Array<number>(q);
      let rest = key;
      let total = 0;
      for (let k = 0; k < q; k++) {
        c[k] = rest % B;
        rest = (rest - c[k]) / B;
        total += c[k];
      }
      counts.push(c);
      totals.push(total);
      weights.push(byKey.get(key)!);
    }
    return { counts, totals, weights };
  }
  const byText = new Map<string, { c: number[]; total: number; w: number }>();
  const c = new Array<number>(q);
  for (let i = 0, o = 0; i < m.rows; i++, o += R) {
    c.fill(0);
    let total = 0;
    for (let j = 0; j < R; j++) {
      const code = codes[o + j];
      if (code >= 0) {
        c[code] += 1;
        total += 1;
      }
    }
    if (total === 0) continue;
    const w = m.weights === null ? 1 : m.weights[i];
    const key = c.join(",");
    const g = byText.get(key);
    if (g) g.w += w;
    else byText.set(key, { c: [...c], total, w });
  }
  const sorted = [...byText.values()].sort((x, y) => {
    for (let k = q - 1; k >= 0; k--) if (x.c[k] !== y.c[k]) return x.c[k] - y.c[k];
    return 0;
  });
  for (const g of sorted) {
    counts.push(g.c);
    totals.push(g.total);
    weights.push(g.w);
  }
  return { counts, totals, weights };
}

/**
 * Numeric value of each category for interval/ratio metrics: the number itself when every
 * category is numeric, else its 1-based rank in the given order (equal spacing assumed).
 */
export function categoryValues(p: { keys: string[]; orderGiven: boolean }, fn: string): number[] {
  if (p.keys.every(isNumericKey)) return p.keys.map(Number);
  if (p.orderGiven) return p.keys.map((_, i) => i + 1);
  throw new Error(`${fn}: interval and ratio levels need numeric ratings or an ordered categories list`);
}
