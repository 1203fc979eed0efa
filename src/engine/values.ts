import { CellError, EmptyValue, ErrorType, SimpleRangeValue } from 'hyperformula';
import { order, Spectrum, spectrumToTable } from '../core/spectrum';
import type { CallError, CallResult, SpectrumResult } from '../functions/invoke';
import { markStable } from '../functions/parse-memo';
import { SpectrumValue } from '../functions/spectral';

/**
 * Conversions between HyperFormula's internal values and the plain shapes the function table expects
 * (the same shapes Excel passes a custom function: numbers, strings, booleans, null for blank/omitted,
 * 2-D arrays for ranges).
 */

/** A value as the table's impl receives it (a SpectrumValue only for an argument marked `spectrum`). */
export type Plain = number | string | boolean | null | PlainCell[][] | SpectrumValue;
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
const PLAIN = Symbol('plain rows');
type WithRows = SimpleRangeValue & { [PLAIN]?: PlainCell[][] };

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
export function toPlain(v: unknown, cache?: RangeCache, spectrum = false): Plain {
  if (v instanceof SpectrumRange) return spectrum ? new SpectrumValue(v.spectrum) : v.rows();
  if (v instanceof SimpleRangeValue) {
    const known = (v as WithRows)[PLAIN];
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

const errorOf = (e: CallError): CellError => new CellError(ERROR_TYPE[e.code], e.message);

/** HyperFormula's private fields this module's subclass touches (SimpleRangeValue.js, hyperformula 3.5). */
interface RangeValueInternals {
  _data?: unknown[][];
}

/**
 * A spectrum-producing call's result as a range value whose table is written only when something reads it.
 * Its size (N + 1 rows × 4) is known up front, which is all HyperFormula needs to pass it along; an enclosing
 * HC call takes the Spectrum itself (toPlain), anything else that reads the cells gets the table, written on
 * the first read through SimpleRangeValue's own ensureThatComputed (every read of its data goes through it).
 */
export class SpectrumRange extends SimpleRangeValue {
  constructor(readonly spectrum: Spectrum) {
    // The base constructor takes its size from data[0].length and data.length; this stand-in has just those.
    super({ length: order(spectrum) + 1, 0: { length: 4 } } as unknown as never[][]);
    (this as unknown as RangeValueInternals)._data = undefined;
  }

  /** The table (written now if it was not yet). */
  rows(): PlainCell[][] {
    return this.rawData() as PlainCell[][];
  }
}

// SimpleRangeValue declares ensureThatComputed private, so it is replaced on the prototype rather than
// overridden in the class body. Each SpectrumRange writes its own rows: the engine may pad or splice a spill's.
Object.defineProperty(SpectrumRange.prototype, 'ensureThatComputed', {
  value(this: SpectrumRange): void {
    const self = this as unknown as RangeValueInternals;
    if (self._data === undefined) self._data = spectrumToTable(this.spectrum);
  },
});

/** A spectrum call's result as a HyperFormula value (see SpectrumRange), or its error. */
export function fromSpectrumResult(result: SpectrumResult): SpectrumRange | CellError {
  return result.ok ? new SpectrumRange(result.spectrum) : errorOf(result);
}

/**
 * A table call's result as a HyperFormula value: a scalar, a range (spilled) or a CellError with the message.
 * `copy` false is for a result that only another HC call reads (through toPlain); otherwise the rows are
 * copied, because the engine keeps and may pad or splice the rows of a spill, and cached results must stay
 * intact.
 */
export function fromResult(result: CallResult, copy = true): number | string | boolean | SimpleRangeValue | CellError {
  if (!result.ok) return errorOf(result);
  const v = result.value;
  if (!Array.isArray(v)) return v;
  if (v.length === 0 || v[0].length === 0) return new CellError(ErrorType.VALUE, 'The result is empty.');
  const range = SimpleRangeValue.onlyValues(copy ? v.map((row) => row.slice()) : v);
  (range as WithRows)[PLAIN] = v as PlainCell[][];
  // Not marked stable (parse-memo.ts): a nested result is normally read once, so a parse memo per result
  // would cost more than the rare second parse it saves.
  return range;
}

/** Rows × columns of a value (1 × 1 for a scalar or an error). */
export function sizeOf(v: unknown): { rows: number; cols: number } {
  if (v instanceof SimpleRangeValue) return { rows: v.height(), cols: v.width() };
  return { rows: 1, cols: 1 };
}
