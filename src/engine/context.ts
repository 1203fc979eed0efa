import type { SimpleCellAddress } from 'hyperformula';
import type { CallResult, SpectrumResult } from '../functions/invoke';
import { sameArgs } from './memo-key';
import type { Plain } from './values';

/**
 * Per-engine state shared by the function plugin and the engine builder. HyperFormula hands the config's
 * `context` to every plugin instance of an engine, so this is how the plugin and `settleSpills` meet.
 *
 * Why it exists: HyperFormula fixes a spilled result's size when it reads a formula
 * (sizeOfResultArrayMethod), but the size of most HC results depends on argument values (the harmonic
 * count, a spectrum's length, a sweep's length). The plugin's size method therefore evaluates the call;
 * while a workbook is being built, referenced cells are not computed yet, so such formulas are sized
 * provisionally and re-read once everything has a value (settleSpills).
 */
export interface EngineContext {
  readonly kind: typeof CONTEXT_KIND;
  /** True while HyperFormula builds the sheets: referenced cells have no values yet. */
  building: boolean;
  /** Formula cells whose spill size must be read again, as "sheet:row:col" keys, with the reason. */
  pending: Map<string, string>;
  /** Size fixed for each (call node, cell) when the formula was read, and why it is provisional if so. */
  predicted: WeakMap<object, Map<string, PredictedSize>>;
  /**
   * Results of table calls computed by a size method, keyed by function and a hash of the arguments
   * (memo-key.ts), so that the evaluation which follows (and any identical call) reuses them; each entry keeps
   * its arguments to confirm a hit. Calls made by evaluation alone are not stored: in a recalculation nothing
   * asks for them again, and holding hundreds of recent tables made the garbage collector copy them over and
   * over (a third of a 10,000-row recalculation).
   */
  memo: Map<string, MemoEntry>;
  /** Memo entries per function name, so that a call whose function has none skips hashing its arguments. */
  memoCount: Map<string, number>;
  /**
   * Above 0 while computing results that will be asked for again soon, which the memo then stores: a size
   * method (its evaluation follows), or the evaluation of a provisionally sized formula (settleSpills sizes it
   * again). Nested calls computed meanwhile are stored too.
   */
  remember: number;
  /** Above 0 while a size method evaluates a call (at parse time): the range cache is not used then. */
  sizing: number;
  /** Range arguments served from the range cache (values.ts RangeCache); for tests. */
  rangeCacheHits: number;
  /** HC calls being evaluated, outermost first: above 1, the call is an argument of another HC call. */
  depth: number;
  /** Called after each table call that was computed (not served from memo); drives the CLI's progress bar. */
  onCall?: (name: string) => void;
}

export interface PredictedSize {
  rows: number;
  cols: number;
  /** Set when the size is a placeholder: says why the real size was not known. */
  provisional?: string;
}

type Result = CallResult | SpectrumResult;

export interface MemoEntry {
  name: string;
  args: readonly Plain[];
  result: Result;
}

export const CONTEXT_KIND = 'harmonic-cells-engine-context';
export const MEMO_ENTRIES = 128;

export function newContext(): EngineContext {
  return {
    kind: CONTEXT_KIND, building: false, pending: new Map(), predicted: new WeakMap(), memo: new Map(), memoCount: new Map(), remember: 0, sizing: 0, rangeCacheHits: 0, depth: 0,
  };
}

export function isEngineContext(v: unknown): v is EngineContext {
  return typeof v === 'object' && v !== null && (v as { kind?: unknown }).kind === CONTEXT_KIND;
}

export const addressKey = (a: SimpleCellAddress): string => `${a.sheet}:${a.row}:${a.col}`;

export function parseAddressKey(key: string): SimpleCellAddress {
  const [sheet, row, col] = key.split(':').map(Number);
  return { sheet, row, col };
}

export function recordPrediction(ctx: EngineContext, node: object, where: string, p: PredictedSize): void {
  let perCell = ctx.predicted.get(node);
  if (!perCell) ctx.predicted.set(node, (perCell = new Map()));
  perCell.set(where, p);
}

/**
 * A memoised table call: most recent last, oldest dropped beyond MEMO_ENTRIES; a hash collision recomputes.
 * A computed result is stored only while `remember` is set (see EngineContext.memo).
 */
export function memoised<R extends Result>(
  ctx: EngineContext,
  key: string | undefined,
  args: readonly Plain[],
  compute: () => R,
): R {
  if (key === undefined) return compute();
  const hit = ctx.memo.get(key);
  if (hit && sameArgs(hit.args, args)) {
    ctx.memo.delete(key);
    ctx.memo.set(key, hit);
    return hit.result as R; // the key starts with the function's name, so the entry is of this function's kind
  }
  const result = compute();
  if (ctx.remember === 0) return result;
  const name = key.slice(0, key.indexOf('\u0000'));
  if (hit) forget(ctx, key, hit);
  ctx.memo.set(key, { name, args, result });
  ctx.memoCount.set(name, (ctx.memoCount.get(name) ?? 0) + 1);
  if (ctx.memo.size > MEMO_ENTRIES) {
    const oldest = ctx.memo.keys().next().value as string;
    forget(ctx, oldest, ctx.memo.get(oldest) as MemoEntry);
  }
  return result;
}

function forget(ctx: EngineContext, key: string, entry: MemoEntry): void {
  ctx.memo.delete(key);
  const left = (ctx.memoCount.get(entry.name) ?? 1) - 1;
  if (left > 0) ctx.memoCount.set(entry.name, left);
  else ctx.memoCount.delete(entry.name);
}
