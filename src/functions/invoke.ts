import { ErrorCode, HcError } from '../core/errors';
import { checkTableable, Spectrum } from '../core/spectrum';
import { FunctionSpec, Returned } from './spec';

export type CallError = { ok: false; code: ErrorCode; message: string };
/** What an adapter gets back from a call: a value, or an error it turns into its own error type. */
export type CallResult = { ok: true; value: Returned } | CallError;
/** A spectrum-producing call's result kept as the spectrum (spectral.ts); its table is promised to exist. */
export type SpectrumResult = { ok: true; spectrum: Spectrum } | CallError;

function failure(spec: FunctionSpec, e: unknown): CallError {
  if (e instanceof HcError) return { ok: false, code: e.code, message: e.message };
  const detail = e instanceof Error ? e.message : String(e);
  return { ok: false, code: 'VALUE', message: `HC.${spec.name} could not compute a result: ${detail}` };
}

/**
 * Call one table entry with raw adapter arguments. Every exception becomes an error result, and a non-finite
 * number never leaves: it is reported as #NUM! with the function's name, so a cell never shows NaN or Infinity.
 */
export function invoke(spec: FunctionSpec, args: unknown[]): CallResult {
  let value: Returned;
  try {
    value = spec.impl(...args);
  } catch (e) {
    return failure(spec, e);
  }
  if (!allFinite(value)) {
    return { ok: false, code: 'NUM', message: `HC.${spec.name}: the result is not a finite number for these inputs.` };
  }
  return { ok: true, value };
}

/**
 * Call a spectrum-producing entry for its spectrum. The result is exactly what `invoke` would give: the same
 * errors (checkTableable throws what writing the table would), and a table of finite numbers when it succeeds.
 */
export function invokeSpectrum(spec: FunctionSpec, args: unknown[]): SpectrumResult {
  if (!spec.spectrum) throw new Error(`HC.${spec.name} does not produce a spectrum.`);
  try {
    const spectrum = spec.spectrum(...args);
    checkTableable(spectrum);
    return { ok: true, spectrum };
  } catch (e) {
    return failure(spec, e);
  }
}

function allFinite(v: Returned): boolean {
  if (typeof v === 'number') return Number.isFinite(v);
  if (Array.isArray(v)) {
    for (const row of v) for (const c of row) if (typeof c === 'number' && !Number.isFinite(c)) return false;
  }
  return true;
}
