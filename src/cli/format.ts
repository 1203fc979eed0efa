import { isErrorValue, PlainValue } from '../engine/results';

/** A number at full precision: JavaScript's shortest text that reads back as the same double. */
export function formatNumber(x: number): string {
  return Object.is(x, -0) ? '0' : String(x);
}

export function formatValue(v: PlainValue): string {
  if (isErrorValue(v)) return v.error;
  if (v === null) return '';
  if (typeof v === 'number') return formatNumber(v);
  if (typeof v === 'boolean') return v ? 'TRUE' : 'FALSE';
  return v;
}

/** An error with its message, as printed on stderr: "#NUM! harmonics must be …". */
export function formatError(v: { error: string; message: string }): string {
  return v.message ? `${v.error} ${v.message}` : v.error;
}

/** Rows of values as tab-separated lines. */
export function formatRows(rows: PlainValue[][]): string {
  return rows.map((r) => r.map(formatValue).join('\t')).join('\n');
}
