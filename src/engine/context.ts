import type { SimpleCellAddress } from 'hyperformula';
import type { CallResult } from '../functions/invoke';
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
   * Results of recent table calls keyed by function and a hash of the arguments (memo-key.ts), so the size
   * method's work is reused; each entry keeps its arguments to confirm a hit.
   */
  memo: Map<string, MemoEntry>;
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

export interface MemoEntry {
  args: readonly Plain[];
  result: CallResult;
}

export const CONTEXT_KIND = 'harmonic-cells-engine-context';
export const MEMO_ENTRIES = 128;

export function newContext(): EngineContext {
  return { kind: CONTEXT_KIND, building: false, pending: new Map(), predicted: new WeakMap(), memo: new Map(), depth: 0 };
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

/** A memoised table call: most recent last, oldest dropped beyond MEMO_ENTRIES; a hash collision recomputes. */
export function memoised(
  ctx: EngineContext,
  key: string | undefined,
  args: readonly Plain[],
  compute: () => CallResult,
): CallResult {
  if (key === undefined) return compute();
  const hit = ctx.memo.get(key);
  if (hit && sameArgs(hit.args, args)) {
    ctx.memo.delete(key);
    ctx.memo.set(key, hit);
    return hit.result;
  }
  const result = compute();
  ctx.memo.delete(key);
  ctx.memo.set(key, { args, result });
  if (ctx.memo.size > MEMO_ENTRIES) ctx.memo.delete(ctx.memo.keys().next().value as string);
  return result;
}
