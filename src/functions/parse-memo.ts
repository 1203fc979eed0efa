/**
 * Memoised parses of tables (a spectrum, a ladder) by the identity of the grid an adapter hands over.
 *
 * Only grids an adapter has declared *stable* are memoised: arrays it promises never to modify, such as the
 * headless engine's cached range values (src/engine/values.ts). A stable grid
 * passed again (the same range in 10,000 rows, a spilled table read by several calls) is parsed once; the
 * value returned is the very object the first parse produced, so it is exactly what parsing would give.
 * Other grids (Excel's, which are fresh arrays on every call) are parsed every time, as before.
 *
 * Parsed values are shared: the core never writes into a Spectrum or LadderTable it is given (it reads them
 * and builds new ones), and callers must keep it that way. A parse that throws is not stored.
 */
/**
 * The memo of a stable grid lives on the grid itself, under a symbol (non-enumerable, so the grid still reads
 * and compares as plain rows): it goes when the grid goes, with no weak table for the garbage collector to
 * sweep (an engine edit makes a new stable grid per changed range, thousands in a session).
 */
const MEMO = Symbol('parsed tables');
type Memo = Map<string, unknown>;

/** Declare a grid stable: it and its rows will never be modified. */
export function markStable(grid: object): void {
  if (!(MEMO in grid)) Object.defineProperty(grid, MEMO, { value: new Map() as Memo });
}

export const isStable = (grid: unknown): boolean => typeof grid === 'object' && grid !== null && MEMO in grid;

/** `parse(grid)`, memoised under `kind` when the grid is stable. */
export function parseOnce<T>(grid: unknown, kind: string, parse: (g: unknown) => T): T {
  const memo = typeof grid === 'object' && grid !== null ? ((grid as { [MEMO]?: Memo })[MEMO]) : undefined;
  if (!memo) return parse(grid);
  if (memo.has(kind)) return memo.get(kind) as T;
  const value = parse(grid);
  memo.set(kind, value);
  return value;
}
