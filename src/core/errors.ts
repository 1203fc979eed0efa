/**
 * The one error type of the core. `code` is the spreadsheet error it becomes at the adapter boundary
 * (DESIGN §3): VALUE for wrong types or shapes, NUM for out-of-range numbers, NA for a missing element.
 * Core functions throw it; the adapters catch it, so no exception ever reaches a cell.
 */
export type ErrorCode = 'VALUE' | 'NUM' | 'NA';

export class HcError extends Error {
  constructor(public readonly code: ErrorCode, message: string) {
    super(message);
    this.name = 'HcError';
  }
}

export const valueError = (message: string): HcError => new HcError('VALUE', message);
export const numError = (message: string): HcError => new HcError('NUM', message);
export const naError = (message: string): HcError => new HcError('NA', message);

/** Require a finite number; `what` names the argument in the message. */
export function finite(x: number, what: string): number {
  if (typeof x !== 'number' || Number.isNaN(x)) throw valueError(`${what} must be a number.`);
  if (!Number.isFinite(x)) throw numError(`${what} must be finite, got ${x}.`);
  return x;
}
