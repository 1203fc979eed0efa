import { naError, numError, valueError } from './errors';
import { LIMITS } from './limits';
import { parsePartValue, PartKind } from './units';

/**
 * The ladder table of DESIGN §2, parsed once into typed arrays so that the evaluators (network.ts) can re-run
 * the same topology with other values (a design case, a tolerance corner) without reading text again.
 *
 * Rows go from the source towards the far end. A branch is a `series` or `shunt` row followed by any number
 * of `+` rows (element in series with the branch built so far) and `||` rows (element across the branch built
 * so far): the branch impedance is the left fold W = Z₀, W = W + Zₖ or W = W ∥ Zₖ.
 */

/** Roles, as stored in `LadderTable.role`. */
export const SERIES = 0;
export const SHUNT = 1;
export const PLUS = 2;
export const ACROSS = 3;
export type Role = typeof SERIES | typeof SHUNT | typeof PLUS | typeof ACROSS;

/** Kinds, as stored in `LadderTable.kind`. */
export const R = 0;
export const L = 1;
export const C = 2;
export type Kind = typeof R | typeof L | typeof C;
export const KIND_LETTER: readonly PartKind[] = ['R', 'L', 'C'];

export interface LadderTable {
  /** Number of element rows (header and blank rows are not counted). */
  readonly rows: number;
  readonly role: Int8Array;
  readonly kind: Int8Array;
  /** Base units: Ω, H, F. Always > 0 and finite. */
  readonly value: Float64Array;
  /** ± percent, 0 ≤ t < 100. */
  readonly tolerance: Float64Array;
  /** Designators as written ('' where none). */
  readonly names: readonly string[];
  /** Branch b holds rows branchStart[b] … branchStart[b + 1] − 1; length branches + 1. */
  readonly branchStart: Int32Array;
  readonly branches: number;
  /** 1-based row of the given range each element row came from, for messages. */
  readonly sheetRow: Int32Array;
}

/**
 * Role spellings, after trimming, lower-casing and collapsing inner spaces. `+` and `||` have word forms that
 * cannot be mistaken for the branch starters: "in series" starts a branch, "in series with" adds to one.
 */
const ROLE_FORMS: Readonly<Record<string, Role>> = {
  series: SERIES, 'in series': SERIES, 'series branch': SERIES,
  shunt: SHUNT, 'to ground': SHUNT, 'shunt branch': SHUNT, 'shunt to ground': SHUNT,
  '+': PLUS, plus: PLUS, add: PLUS, 'in series with': PLUS, 'series with': PLUS,
  '||': ACROSS, '\u2225': ACROSS, '//': ACROSS, across: ACROSS, parallel: ACROSS, 'in parallel': ACROSS,
  'parallel with': ACROSS, 'in parallel with': ACROSS,
};
const ROLE_HELP =
  'series (in series, series branch), shunt (to ground, shunt branch), + (plus, add, in series with) ' +
  'or || (across, parallel, in parallel)';

const KIND_FORMS: Readonly<Record<string, Kind>> = {
  r: R, resistor: R, resistance: R,
  l: L, inductor: L, inductance: L,
  c: C, capacitor: C, capacitance: C,
};
const KIND_HELP = 'R, L or C (or resistor, inductor, capacitor)';

/**
 * The spellings as maps (a Map has no inherited keys: "constructor" is not a role), with the exact spellings
 * a table usually holds ("series", "L") also under themselves, so that those skip normalising.
 */
function spellings<T>(forms: Readonly<Record<string, T>>): Map<string, T> {
  const m = new Map<string, T>(Object.entries(forms));
  for (const [k, v] of Object.entries(forms)) if (k.length === 1) m.set(k.toUpperCase(), v);
  return m;
}
const ROLES = spellings(ROLE_FORMS);
const KINDS = spellings(KIND_FORMS);

/** The code a cell spells, as written or after trimming, lower-casing and collapsing inner spaces. */
function lookup<T>(forms: Map<string, T>, cell: unknown): T | undefined {
  if (typeof cell !== 'string') return undefined;
  return forms.get(cell) ?? forms.get(words(cell));
}

const isBlank = (v: unknown): boolean => v === null || v === undefined || (typeof v === 'string' && v.trim() === '');
const words = (v: unknown): string => (typeof v === 'string' ? v.trim().toLowerCase().replace(/\s+/g, ' ') : '');
const show = (v: unknown): string => {
  const t = typeof v === 'string' ? v : String(v);
  return JSON.stringify(t.length > 30 ? `${t.slice(0, 27)}...` : t);
};

function readTolerance(cell: unknown, where: string): number {
  if (isBlank(cell)) return 0;
  let t: number;
  if (typeof cell === 'number') t = cell;
  else if (typeof cell === 'string') {
    const s = cell.trim().replace(/^\u00b1|^\+\/-/, '').replace(/%$/, '').trim();
    t = s === '' ? NaN : Number(s);
  } else t = NaN;
  if (Number.isNaN(t)) throw valueError(`${where}: tolerance must be a percentage such as 5 or 5%, got ${show(cell)}.`);
  if (!(t >= 0 && t < 100)) throw numError(`${where}: tolerance must be a percentage from 0 up to (not including) 100, got ${t}.`);
  return t;
}

function readName(cell: unknown, where: string): string {
  if (isBlank(cell)) return '';
  if (typeof cell === 'string') return cell.trim();
  if (typeof cell === 'number' && Number.isFinite(cell)) return String(cell);
  throw valueError(`${where}: name must be text such as L1 or C3, got ${show(cell)}.`);
}

/**
 * Read a ladder table: a range or nested array of rows [role, kind, value, tolerance %?, name?]. One leading
 * header row (a row whose role and kind are both unrecognised) and blank rows are skipped. `what` names the
 * argument in messages.
 */
export function parseLadder(grid: unknown, what = 'ladder'): LadderTable {
  const shape = `${what} must be a table of rows [role, kind, value, tolerance %, name]`;
  if (!Array.isArray(grid) || grid.length === 0) throw valueError(`${shape}.`);
  const raw: unknown[][] = grid.some(Array.isArray) ? grid.map((r) => (Array.isArray(r) ? r : [r])) : [grid];

  const role: number[] = [];
  const kind: number[] = [];
  const value: number[] = [];
  const tolerance: number[] = [];
  const names: string[] = [];
  const sheetRow: number[] = [];
  const starts: number[] = [];
  const seen = new Map<string, number>();
  let headerSkipped = false;

  for (let r = 0; r < raw.length; r++) {
    const row = raw[r];
    // A row with a number for its value is not blank (the common case, checked first).
    if (typeof row[2] !== 'number' && row.every(isBlank)) continue;
    const where = `${what} row ${r + 1}`;
    const roleCode = lookup(ROLES, row[0]);
    const kindCode = lookup(KINDS, row[1]);
    if (role.length === 0 && !headerSkipped && roleCode === undefined && kindCode === undefined && typeof row[2] !== 'number') {
      headerSkipped = true;
      continue;
    }
    for (let k = 5; k < row.length; k++) {
      if (!isBlank(row[k])) throw valueError(`${where} has more than 5 columns; ${shape}.`);
    }
    if (roleCode === undefined) throw valueError(`${where}: role ${show(row[0] ?? '')} is not known; use ${ROLE_HELP}.`);
    if (kindCode === undefined) throw valueError(`${where}: kind ${show(row[1] ?? '')} is not known; use ${KIND_HELP}.`);
    if (role.length === 0 && roleCode !== SERIES && roleCode !== SHUNT) {
      throw valueError(`${where}: the first element must start a branch (series or shunt); + and || add to the branch above.`);
    }
    if (role.length >= LIMITS.ladderRows) {
      throw numError(`${what} has more than ${LIMITS.ladderRows} element rows; at most ${LIMITS.ladderRows} are allowed.`);
    }
    const name = readName(row[4], where);
    if (name !== '') {
      const key = name.toLowerCase();
      const prev = seen.get(key);
      if (prev !== undefined) {
        throw valueError(`${where}: name ${show(name)} is already used by element ${prev}; names must be unique.`);
      }
      seen.set(key, role.length + 1);
    }
    if (roleCode === SERIES || roleCode === SHUNT) starts.push(role.length);
    role.push(roleCode);
    kind.push(kindCode);
    // A plain positive number is its own value (what parsePartValue returns for it); text and bad numbers go
    // through parsePartValue for its reading and its message.
    const v = row[2];
    value.push(typeof v === 'number' && v > 0 && v < Infinity ? v : parsePartValue(v, KIND_LETTER[kindCode], `${where}: value`));
    tolerance.push(readTolerance(row[3], where));
    names.push(name);
    sheetRow.push(r + 1);
  }
  if (role.length === 0) throw valueError(`${what} has no element rows; ${shape}.`);
  starts.push(role.length);

  return {
    rows: role.length,
    role: new Int8Array(role),
    kind: new Int8Array(kind),
    value: new Float64Array(value),
    tolerance: new Float64Array(tolerance),
    names,
    branchStart: new Int32Array(starts),
    branches: starts.length - 1,
    sheetRow: new Int32Array(sheetRow),
  };
}

/** Check a values override (one value per element row, each > 0 and finite); returns it unchanged. */
export function checkValues(table: LadderTable, values: ArrayLike<number>, what = 'values'): ArrayLike<number> {
  if (values.length !== table.rows) {
    throw valueError(`${what} must hold one value per ladder row: the ladder has ${table.rows} rows, ${what} has ${values.length}.`);
  }
  for (let i = 0; i < values.length; i++) {
    const v = values[i];
    if (typeof v !== 'number' || Number.isNaN(v)) throw valueError(`${what}: entry ${i + 1} must be a number.`);
    if (!(v > 0 && v < Infinity)) {
      throw numError(`${what}: entry ${i + 1} (${describeElement(table, i)}) must be a finite value greater than 0, got ${v}.`);
    }
  }
  return values;
}

/** The same ladder with the value column replaced (DESIGN §2 values override). The input table is not changed. */
export function withValues(table: LadderTable, values: ArrayLike<number>, what = 'values'): LadderTable {
  checkValues(table, values, what);
  return { ...table, value: Float64Array.from(values) };
}

/**
 * Read a values override from a range: a single row or a single column of numbers or engineering text
 * (4k7, 100 nF), one per element row; blank cells are not allowed. Units follow each row's kind.
 */
export function valuesFromGrid(grid: unknown, table: LadderTable, what = 'values'): Float64Array {
  const cells: unknown[] = [];
  if (Array.isArray(grid)) {
    const rows = grid.map((r) => (Array.isArray(r) ? r : [r]));
    const wide = rows.length === 1;
    if (!wide && rows.some((r) => r.length !== 1)) {
      throw valueError(`${what} must be a single row or a single column with one value per ladder row.`);
    }
    for (const r of rows) cells.push(...(wide ? r : [r[0]]));
  } else cells.push(grid);
  if (cells.length !== table.rows) {
    throw valueError(`${what} must hold one value per ladder row: the ladder has ${table.rows} rows, ${what} has ${cells.length}.`);
  }
  const out = new Float64Array(table.rows);
  for (let i = 0; i < table.rows; i++) {
    out[i] = parsePartValue(cells[i], KIND_LETTER[table.kind[i]], `${what} entry ${i + 1} (${describeElement(table, i)})`);
  }
  return out;
}

/** "L1 (row 2)" or "row 2", for messages. */
export function describeElement(table: LadderTable, row: number): string {
  return table.names[row] ? `${table.names[row]} (row ${row + 1})` : `row ${row + 1}`;
}

/**
 * Pick an element by name (case-insensitive) or by 1-based element row; returns the 0-based row.
 * A blank element (null, undefined, '') returns −1, the "default" of the functions that take one.
 */
export function findElement(table: LadderTable, element: unknown, what = 'element'): number {
  if (isBlank(element)) return -1;
  const available = (): string => {
    const named = table.names.filter((n) => n !== '');
    const rows = `rows 1 to ${table.rows}`;
    return named.length ? `names ${named.join(', ')} or ${rows}` : rows;
  };
  if (typeof element === 'string') {
    const key = element.trim().toLowerCase();
    const hit = table.names.findIndex((n) => n !== '' && n.toLowerCase() === key);
    if (hit >= 0) return hit;
    const asNumber = Number(element.trim());
    if (!/^\d+(\.\d*)?$/.test(element.trim()) || !Number.isFinite(asNumber)) {
      throw naError(`${what} ${show(element.trim())} is not in the ladder; use ${available()}.`);
    }
    element = asNumber;
  }
  if (typeof element !== 'number' || Number.isNaN(element)) {
    throw valueError(`${what} must be a name or a row number; use ${available()}.`);
  }
  if (Math.floor(element) !== element) throw numError(`${what} row must be a whole number, got ${element}; use ${available()}.`);
  if (element < 1 || element > table.rows) throw naError(`${what} row ${element} is not in the ladder; use ${available()}.`);
  return element - 1;
}
