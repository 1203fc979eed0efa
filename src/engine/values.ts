import { CellError, EmptyValue, ErrorType, SimpleRangeValue } from 'hyperformula';
import type { CallResult } from '../functions/invoke';

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
 * One argument in plain form. A CellError argument, or an error anywhere inside a range, stops the call:
 * ErrorArgument is thrown so that the caller returns that error, as a spreadsheet propagates errors.
 */
export function toPlain(v: unknown): Plain {
  if (v instanceof SimpleRangeValue) {
    const data = v.rawData();
    const out: PlainCell[][] = new Array(data.length);
    for (let r = 0; r < data.length; r++) {
      const row = data[r];
      const plainRow: PlainCell[] = new Array(row.length);
      for (let c = 0; c < row.length; c++) plainRow[c] = scalarToPlain(row[c]);
      out[r] = plainRow;
    }
    return out;
  }
  return scalarToPlain(v);
}

const ERROR_TYPE = { VALUE: ErrorType.VALUE, NUM: ErrorType.NUM, NA: ErrorType.NA } as const;

/** A table call's result as a HyperFormula value: a scalar, a range (spilled) or a CellError with the message. */
export function fromResult(result: CallResult): number | string | boolean | SimpleRangeValue | CellError {
  if (!result.ok) return new CellError(ERROR_TYPE[result.code], result.message);
  const v = result.value;
  if (!Array.isArray(v)) return v;
  if (v.length === 0 || v[0].length === 0) return new CellError(ErrorType.VALUE, 'The result is empty.');
  // Copied: the engine may keep and pad the rows it is given, and cached results must stay intact.
  return SimpleRangeValue.onlyValues(v.map((row) => row.slice()));
}

/** Rows × columns of a value (1 × 1 for a scalar or an error). */
export function sizeOf(v: unknown): { rows: number; cols: number } {
  if (v instanceof SimpleRangeValue) return { rows: v.height(), cols: v.width() };
  return { rows: 1, cols: 1 };
}
