import { ErrorCode, HcError } from '../core/errors';
import { FunctionSpec, Returned } from './spec';

/** What an adapter gets back from a call: a value, or an error it turns into its own error type. */
export type CallResult = { ok: true; value: Returned } | { ok: false; code: ErrorCode; message: string };

/**
 * Call one table entry with raw adapter arguments. Every exception becomes an error result, and a non-finite
 * number never leaves: it is reported as #NUM! with the function's name, so a cell never shows NaN or Infinity.
 */
export function invoke(spec: FunctionSpec, args: unknown[]): CallResult {
  let value: Returned;
  try {
    value = spec.impl(...args);
  } catch (e) {
    if (e instanceof HcError) return { ok: false, code: e.code, message: e.message };
    const detail = e instanceof Error ? e.message : String(e);
    return { ok: false, code: 'VALUE', message: `HC.${spec.name} could not compute a result: ${detail}` };
  }
  if (!allFinite(value)) {
    return { ok: false, code: 'NUM', message: `HC.${spec.name}: the result is not a finite number for these inputs.` };
  }
  return { ok: true, value };
}

function allFinite(v: Returned): boolean {
  if (typeof v === 'number') return Number.isFinite(v);
  if (Array.isArray(v)) {
    for (const row of v) for (const c of row) if (typeof c === 'number' && !Number.isFinite(c)) return false;
  }
  return true;
}
