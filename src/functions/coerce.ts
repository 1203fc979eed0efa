import { numError, valueError } from '../core/errors';
import { parseValue } from '../core/units';

/**
 * Argument coercion shared by every adapter. Excel passes null for an omitted argument and a 2-D array for a
 * range; the headless engine passes the same shapes once converted. Blank cells arrive as null, undefined or "".
 */
export type Cell = number | string | boolean | null | undefined;
export type Grid = Cell[][];

export const isBlank = (v: unknown): boolean =>
  v === null || v === undefined || (typeof v === 'string' && v.trim() === '');

/** A 1×1 range stands for its single value. */
function unwrap(v: unknown): unknown {
  while (Array.isArray(v) && v.length === 1) {
    const row = v[0];
    if (Array.isArray(row) && row.length === 1) v = row[0];
    else if (!Array.isArray(row)) v = row;
    else break;
  }
  return v;
}

export function asNumber(v: unknown, name: string, fallback?: number): number {
  v = unwrap(v);
  if (isBlank(v)) {
    if (fallback !== undefined) return fallback;
    throw valueError(`${name} is missing: give a number.`);
  }
  if (Array.isArray(v)) throw valueError(`${name} must be a single number, not a range.`);
  if (typeof v === 'boolean') throw valueError(`${name} must be a number, not ${v ? 'TRUE' : 'FALSE'}.`);
  if (typeof v === 'number') {
    if (Number.isNaN(v)) throw valueError(`${name} must be a number.`);
    if (!Number.isFinite(v)) throw numError(`${name} must be finite.`);
    return v;
  }
  return parseValue(v, undefined, name);
}

export function asInteger(v: unknown, name: string, fallback?: number): number {
  const x = asNumber(v, name, fallback);
  if (Math.floor(x) !== x) throw numError(`${name} must be a whole number, got ${x}.`);
  return x;
}

export function asBool(v: unknown, name: string, fallback: boolean): boolean {
  v = unwrap(v);
  if (isBlank(v)) return fallback;
  if (typeof v === 'boolean') return v;
  if (typeof v === 'number' && (v === 0 || v === 1)) return v === 1;
  if (typeof v === 'string') {
    const t = v.trim().toLowerCase();
    if (t === 'true' || t === 'yes' || t === '1') return true;
    if (t === 'false' || t === 'no' || t === '0') return false;
  }
  throw valueError(`${name} must be TRUE or FALSE.`);
}

/** A text choice, matched case-insensitively against `allowed` (first entry = canonical forms listed in errors). */
export function asChoice<T extends string>(v: unknown, name: string, allowed: Record<string, T>, fallback: T): T {
  v = unwrap(v);
  if (isBlank(v)) return fallback;
  if (typeof v !== 'string') throw valueError(`${name} must be one of ${listChoices(allowed)}.`);
  const hit = allowed[v.trim().toLowerCase()];
  if (hit === undefined) throw valueError(`${name} '${v}' is not known; use one of ${listChoices(allowed)}.`);
  return hit;
}

function listChoices(allowed: Record<string, string>): string {
  return [...new Set(Object.values(allowed))].join(', ');
}

/** One cell's value, as given (a 1×1 range unwrapped); ranges are refused. */
export function asScalar(v: unknown, name: string): Cell {
  v = unwrap(v);
  if (Array.isArray(v)) throw valueError(`${name} must be a single value, not a range.`);
  return v as Cell;
}

export function asText(v: unknown, name: string, fallback?: string): string {
  v = unwrap(v);
  if (isBlank(v)) {
    if (fallback !== undefined) return fallback;
    throw valueError(`${name} is missing: give a text.`);
  }
  if (typeof v === 'string') return v;
  if (typeof v === 'number') return String(v);
  throw valueError(`${name} must be a text.`);
}

/** A range as a 2-D grid (a scalar becomes 1×1). */
export function asGrid(v: unknown, name: string): Grid {
  if (isBlank(v)) throw valueError(`${name} is missing: give a range or an array.`);
  if (!Array.isArray(v)) return [[v as Cell]];
  return (v as unknown[]).map((row) => (Array.isArray(row) ? (row as Cell[]) : [row as Cell]));
}

/**
 * A single row or column of numbers (a frequency sweep, sample values, PWL points), read in sheet order.
 * Blank cells are skipped when `keepBlanks` is false, or kept as null (e.g. "use the table's value").
 */
export function asVector(v: unknown, name: string, keepBlanks = false): (number | null)[] {
  const grid = asGrid(v, name);
  const rows = grid.length;
  const cols = Math.max(...grid.map((r) => r.length));
  if (rows > 1 && cols > 1) throw valueError(`${name} must be a single row or column, got ${rows} × ${cols}.`);
  const out: (number | null)[] = [];
  for (const row of grid) {
    for (const c of row) {
      if (isBlank(c)) {
        if (keepBlanks) out.push(null);
        continue;
      }
      out.push(asNumber(c, name));
    }
  }
  if (!keepBlanks) {
    if (out.length === 0) throw valueError(`${name} holds no numbers.`);
  } else {
    while (out.length > 0 && out[out.length - 1] === null) out.pop();
  }
  return out;
}

export function toFloat64(values: (number | null)[]): Float64Array {
  return Float64Array.from(values as number[]);
}
