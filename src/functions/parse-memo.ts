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
const stable = new WeakSet<object>();
const parsed = new WeakMap<object, Map<string, unknown>>();

/** Declare a grid stable: it and its rows will never be modified. */
export function markStable(grid: object): void {
  stable.add(grid);
}

export const isStable = (grid: unknown): boolean => typeof grid === 'object' && grid !== null && stable.has(grid);

/** `parse(grid)`, memoised under `kind` when the grid is stable. */
export function parseOnce<T>(grid: unknown, kind: string, parse: (g: unknown) => T): T {
  if (typeof grid !== 'object' || grid === null || !stable.has(grid)) return parse(grid);
  let byKind = parsed.get(grid);
  if (byKind?.has(kind)) return byKind.get(kind) as T;
  const value = parse(grid);
  if (!byKind) parsed.set(grid, (byKind = new Map()));
  byKind.set(kind, value);
  return value;
}
