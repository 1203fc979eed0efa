import { numError, valueError } from '../core/errors';
import { grouped, LIMITS } from '../core/limits';
import { parseValue } from '../core/units';
import { SpectrumValue } from './spectral';

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
  const hit = Object.prototype.hasOwnProperty.call(allowed, v.trim().toLowerCase()) ? allowed[v.trim().toLowerCase()] : undefined;
  if (hit === undefined) throw valueError(`${name} '${clip(v)}' is not known; use one of ${listChoices(allowed)}.`);
  return hit;
}

/** A text quoted in a message, cut short so that a huge argument cannot make a huge message. */
export const clip = (t: string): string => (t.length > 40 ? `${t.slice(0, 37)}...` : t);

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
  if (typeof v === 'string') return checkLength(v, name);
  if (typeof v === 'number') return String(v);
  throw valueError(`${name} must be a text.`);
}

/** A text argument longer than LIMITS.textLength is refused before any parsing looks at it. */
export function checkLength(t: string, name: string): string {
  if (t.length > LIMITS.textLength) {
    throw numError(`${name} is a text of ${grouped(t.length)} characters; at most ${LIMITS.textLength} are allowed.`);
  }
  return t;
}

/**
 * A range as a 2-D grid (a scalar becomes 1×1); rows that are not arrays become one-cell rows. At most
 * LIMITS.rangeCells cells, counted before any cell is read.
 */
export function asGrid(v: unknown, name: string): Grid {
  if (isBlank(v)) throw valueError(`${name} is missing: give a range or an array.`);
  // A spectrum handed over by a nested call (spectral.ts) reads as the table it stands for.
  if (v instanceof SpectrumValue) return v.table();
  if (!Array.isArray(v)) return [[v as Cell]];
  let cells = 0;
  let plain = true;
  for (let r = 0; r < v.length; r++) {
    const row: unknown = v[r];
    if (Array.isArray(row)) cells += row.length;
    else {
      cells += 1;
      plain = false;
    }
  }
  if (cells > LIMITS.rangeCells) {
    throw numError(`${name} is a range of ${grouped(cells)} cells; at most ${grouped(LIMITS.rangeCells)} (one whole column) are allowed.`);
  }
  if (plain) return v as Grid;
  return (v as unknown[]).map((row) => (Array.isArray(row) ? (row as Cell[]) : [row as Cell]));
}

export interface VectorOptions {
  /**
   * 'skip' (default): blank cells are left out. 'keep': kept as null (e.g. "use the table's value").
   * 'trailing': blanks after the last number are dropped (a range drawn past the data); any other blank is an
   * error, so that a gap cannot silently shift the numbers after it.
   */
  blanks?: 'skip' | 'keep' | 'trailing';
  /** At most this many entries, checked while reading (a huge range is refused early); NUM beyond. */
  max?: number;
  /** What `max` counts, for its message (default "numbers"). */
  maxWhat?: string;
}

/**
 * A single row or column of numbers (a frequency sweep, sample values, PWL points), read in sheet order.
 * The third argument is the options, or `true` for blanks 'keep' (older form).
 */
export function asVector(v: unknown, name: string, options: VectorOptions | boolean = {}): (number | null)[] {
  const opts: VectorOptions = typeof options === 'boolean' ? { blanks: options ? 'keep' : 'skip' } : options;
  const blanks = opts.blanks ?? 'skip';
  const max = opts.max ?? Infinity;
  const grid = asGrid(v, name);
  const rows = grid.length;
  let cols = 0;
  for (let r = 0; r < rows; r++) if (grid[r].length > cols) cols = grid[r].length; // Math.max(...) would overflow the stack
  if (rows > 1 && cols > 1) throw valueError(`${name} must be a single row or column, got ${rows} × ${cols}.`);
  const out: (number | null)[] = [];
  let pending = 0; // blanks not yet placed: 'keep' places them before the next number, 'trailing' refuses that
  let firstBlank = -1;
  for (let r = 0; r < rows; r++) {
    const row = grid[r];
    for (let k = 0; k < row.length; k++) {
      const c = row[k];
      let x: number;
      if (typeof c === 'number' && c - c === 0) x = c; // the common case first: a finite number
      else if (isBlank(c)) {
        if (blanks === 'skip') continue;
        if (pending === 0) firstBlank = out.length;
        pending++;
        continue;
      } else x = asNumber(c, name);
      if (pending > 0) {
        if (blanks === 'trailing') {
          throw valueError(
            `${name}: entry ${firstBlank + 1} is blank; give a number in every cell up to the last one (a gap would shift the entries after it).`,
          );
        }
        for (; pending > 0; pending--) out.push(null);
      }
      out.push(x);
      if (out.length > max) {
        throw numError(`${name} holds more than ${grouped(max)} ${opts.maxWhat ?? 'numbers'}; at most ${grouped(max)} are allowed.`);
      }
    }
  }
  if (blanks !== 'keep' && out.length === 0) throw valueError(`${name} holds no numbers.`);
  return out;
}

/**
 * A single row or column of numbers into a Float64Array (no per-number allocation: a quarter-million
 * samples read in a few milliseconds). Blanks are skipped ('skip') or allowed only after the last number
 * ('trailing', see VectorOptions); at most `max` numbers.
 */
export function asNumbers(v: unknown, name: string, options: VectorOptions = {}): Float64Array {
  const blanks = options.blanks ?? 'skip';
  if (blanks === 'keep') throw new Error('asNumbers cannot keep blanks; use asVector.');
  const max = options.max ?? LIMITS.rangeCells;
  const grid = asGrid(v, name);
  const rows = grid.length;
  let cols = 0;
  let cells = 0;
  for (let r = 0; r < rows; r++) {
    const n = grid[r].length;
    cells += n;
    if (n > cols) cols = n;
  }
  if (rows > 1 && cols > 1) throw valueError(`${name} must be a single row or column, got ${rows} × ${cols}.`);
  const out = new Float64Array(Math.min(cells, max));
  let j = 0;
  let firstBlank = -1;
  for (let r = 0; r < rows; r++) {
    const row = grid[r];
    for (let k = 0; k < row.length; k++) {
      const c = row[k];
      let x: number;
      if (typeof c === 'number' && c - c === 0) x = c;
      else if (isBlank(c)) {
        if (blanks === 'trailing' && firstBlank < 0) firstBlank = j;
        continue;
      } else x = asNumber(c, name);
      if (firstBlank >= 0) {
        throw valueError(
          `${name}: entry ${firstBlank + 1} is blank; give a number in every cell up to the last one (a gap would shift the entries after it).`,
        );
      }
      if (j >= max) {
        throw numError(`${name} holds more than ${grouped(max)} ${options.maxWhat ?? 'numbers'}; at most ${grouped(max)} are allowed.`);
      }
      out[j++] = x;
    }
  }
  if (j === 0) throw valueError(`${name} holds no numbers.`);
  return j === out.length ? out : out.slice(0, j);
}

export function toFloat64(values: (number | null)[]): Float64Array {
  return Float64Array.from(values as number[]);
}
