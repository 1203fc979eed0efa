import { CellError, EmptyValue, ErrorType, SimpleRangeValue } from 'hyperformula';
import type { CallResult } from '../functions/invoke';
import { markStable } from '../functions/parse-memo';

/**
 * Conversions between HyperFormula's internal values and the plain shapes the function table expects
 * (the same shapes Excel passes a custom function: numbers, strings, booleans, null for blank/omitted,
 * 2-D arrays for ranges).
 */

/** A value as the table's impl receives it. */
export type Plain = number | string | boolean | null | PlainCell[][];
export type PlainCell = number | string | boolean | null;

/** Thrown inside a conversion to stop at the first error argument; carries the CellError to return. */
export class ErrorArgument {
  constructor(readonly error: CellError) {}
}

/** Numbers may arrive wrapped in a typed number (date, percent, currency); the raw double is `val`. */
function rawNumber(v: object): number | undefined {
  const val = (v as { val?: unknown }).val;
  return typeof val === 'number' ? val : undefined;
}

function scalarToPlain(v: unknown): PlainCell {
  if (v === undefined || v === null || v === EmptyValue) return null;
  if (typeof v === 'number' || typeof v === 'string' || typeof v === 'boolean') return v;
  if (v instanceof CellError) throw new ErrorArgument(v);
  if (typeof v === 'object') {
    const n = rawNumber(v);
    if (n !== undefined) return n;
  }
  throw new ErrorArgument(new CellError(ErrorType.VALUE, `Unsupported argument value: ${String(v)}.`));
}

/**
 * The plain rows behind each range value made by fromResult, so that a result passed straight into another
 * call (=HC.RMS(HC.RESPONSE(…))) is not converted back cell by cell. The rows are the call's own result
 * (also held by the memo), never handed to the engine, which may pad the copies it is given.
 */
const plainRows = new WeakMap<SimpleRangeValue, PlainCell[][]>();

/**
 * Where converted range values are kept between calls: HyperFormula's own per-range cache (the `functionCache`
 * of the range's vertex in the dependency graph, which is also where it keeps SUM and friends). HyperFormula
 * clears it whenever a cell of the range changes value (a recalculation reaches the range vertex before any
 * formula reading it), so an entry is valid for as long as it exists. It is only used while formulas are
 * evaluated, never while a size method reads cells at parse time (their values may be from before an edit).
 */
export interface RangeCache {
  get(range: SimpleRangeValue): PlainCell[][] | undefined;
  set(range: SimpleRangeValue, rows: PlainCell[][]): void;
}

/** The key under which the converted rows are kept in a range vertex's cache (not a function name). */
export const RANGE_CACHE_KEY = 'HC plain rows';

/**
 * One argument in plain form. A CellError argument, or an error anywhere inside a range, stops the call:
 * ErrorArgument is thrown so that the caller returns that error, as a spreadsheet propagates errors.
 * Plain rows are shared with the memo and other calls: callers must not modify them.
 *
 * With a `cache`, a range read from the sheet is converted into rows of its own (never the engine's), kept in
 * the cache and declared stable (parse-memo.ts), so that the same range read again, unchanged, is the same
 * grid and the table functions parse it once.
 */
export function toPlain(v: unknown, cache?: RangeCache): Plain {
  if (v instanceof SimpleRangeValue) {
    const known = plainRows.get(v);
    if (known) return known;
    if (cache && v.range) {
      const cached = cache.get(v);
      if (cached) return cached;
      const own = copyPlain(v.rawData() as unknown[][]);
      markStable(own);
      cache.set(v, own);
      return own;
    }
    // The range's own rows (made for this value) are passed on where every cell is already a number, text or
    // boolean; only rows with blanks or wrapped numbers are converted. Saves a copy of every large table.
    const data = v.rawData() as unknown[][];
    let out: PlainCell[][] | undefined;
    for (let r = 0; r < data.length; r++) {
      const row = data[r];
      if (isPlainRow(row)) {
        if (out) out[r] = row as PlainCell[];
        continue;
      }
      out ??= data.slice(0, r) as PlainCell[][];
      out[r] = plainRow(row);
    }
    return out ?? (data as PlainCell[][]);
  }
  return scalarToPlain(v);
}

function plainRow(row: unknown[]): PlainCell[] {
  const out: PlainCell[] = new Array(row.length);
  for (let c = 0; c < row.length; c++) out[c] = scalarToPlain(row[c]);
  return out;
}

/** Rows of our own, converted: nothing shared with the engine's arrays. */
function copyPlain(data: unknown[][]): PlainCell[][] {
  const out: PlainCell[][] = new Array(data.length);
  for (let r = 0; r < data.length; r++) out[r] = plainRow(data[r]);
  return out;
}

function isPlainRow(row: unknown[]): boolean {
  for (let c = 0; c < row.length; c++) {
    const t = typeof row[c];
    if (t !== 'number' && t !== 'string' && t !== 'boolean') return false;
  }
  return true;
}

const ERROR_TYPE = { VALUE: ErrorType.VALUE, NUM: ErrorType.NUM, NA: ErrorType.NA } as const;

/**
 * A table call's result as a HyperFormula value: a scalar, a range (spilled) or a CellError with the message.
 * `copy` false is for a result that only another HC call reads (through toPlain); otherwise the rows are
 * copied, because the engine keeps and may pad or splice the rows of a spill, and cached results must stay
 * intact.
 */
export function fromResult(result: CallResult, copy = true): number | string | boolean | SimpleRangeValue | CellError {
  if (!result.ok) return new CellError(ERROR_TYPE[result.code], result.message);
  const v = result.value;
  if (!Array.isArray(v)) return v;
  if (v.length === 0 || v[0].length === 0) return new CellError(ErrorType.VALUE, 'The result is empty.');
  const range = SimpleRangeValue.onlyValues(copy ? v.map((row) => row.slice()) : v);
  plainRows.set(range, v as PlainCell[][]);
  // Not marked stable (parse-memo.ts): a nested result is normally read once, and a weak entry for each of
  // 10,000 results per recalculation cost the garbage collector more than the rare second parse it saves.
  return range;
}

/** Rows × columns of a value (1 × 1 for a scalar or an error). */
export function sizeOf(v: unknown): { rows: number; cols: number } {
  if (v instanceof SimpleRangeValue) return { rows: v.height(), cols: v.width() };
  return { rows: 1, cols: 1 };
}
