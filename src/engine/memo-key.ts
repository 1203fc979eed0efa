import { Spectrum } from '../core/spectrum';
import { SpectrumValue } from '../functions/spectral';
import type { Plain } from './values';

/**
 * A cheap key for a table call's arguments: a 32-bit hash over every value (numbers by their bits), so that
 * a 200-harmonic spectrum costs microseconds to key instead of a JSON text of ~16 kB. Hashes can collide, so
 * a memo hit is confirmed with `sameArgs`.
 */

const F64 = new Float64Array(1);
const I32 = new Int32Array(F64.buffer);

/** Arguments with more cells than this are not memoised: keeping them costs more memory than the call. */
export const MEMO_MAX_CELLS = 250_000;

function mix(h: number, x: number): number {
  return Math.imul(h ^ x, 0x01000193);
}

function hashCell(h: number, c: unknown): number {
  if (typeof c === 'number') {
    F64[0] = c;
    return mix(mix(h, I32[0]), I32[1]);
  }
  if (typeof c === 'string') {
    h = mix(h, 0x5354 ^ c.length);
    for (let i = 0; i < c.length; i++) h = mix(h, c.charCodeAt(i));
    return h;
  }
  if (typeof c === 'boolean') return mix(h, c ? 0x7472 : 0x6661);
  return mix(h, 0x6e75); // null
}

function hashSpectrum(h: number, s: Spectrum): number {
  h = hashCell(mix(h, 0x53500000 ^ s.re.length), s.f0);
  for (let n = 0; n < s.re.length; n++) h = hashCell(hashCell(h, s.re[n]), s.im[n]);
  return h;
}

/** The key for `name(args)`, or undefined when the arguments are too large to memoise. */
export function callKey(name: string, args: readonly Plain[]): string | undefined {
  let h = 0x811c9dc5;
  let cells = 0;
  for (const a of args) {
    if (a instanceof SpectrumValue) {
      cells += 2 * a.spectrum.re.length;
      if (cells > MEMO_MAX_CELLS) return undefined;
      h = hashSpectrum(h, a.spectrum);
    } else if (Array.isArray(a)) {
      h = mix(h, 0x41520000 ^ a.length);
      for (const row of a) {
        cells += row.length;
        if (cells > MEMO_MAX_CELLS) return undefined;
        h = mix(h, row.length);
        for (let c = 0; c < row.length; c++) h = hashCell(h, row[c]);
      }
    } else {
      cells++;
      h = hashCell(h, a);
    }
  }
  return `${name}\u0000${args.length}\u0000${h >>> 0}`;
}

const sameCell = (a: unknown, b: unknown): boolean => Object.is(a, b);

/** Whether two argument lists hold the same values (bit for bit: −0 is not 0). */
export function sameArgs(a: readonly Plain[], b: readonly Plain[]): boolean {
  if (a === b) return true;
  if (a.length !== b.length) return false;
  for (let i = 0; i < a.length; i++) {
    const x = a[i];
    const y = b[i];
    if (Object.is(x, y)) continue;
    if (x instanceof SpectrumValue || y instanceof SpectrumValue) {
      if (!(x instanceof SpectrumValue && y instanceof SpectrumValue && sameSpectrum(x.spectrum, y.spectrum))) return false;
      continue;
    }
    if (!Array.isArray(x) || !Array.isArray(y)) {
      if (!sameCell(x, y)) return false;
      continue;
    }
    if (x.length !== y.length) return false;
    for (let r = 0; r < x.length; r++) {
      const rx = x[r];
      const ry = y[r];
      if (rx === ry) continue;
      if (rx.length !== ry.length) return false;
      for (let c = 0; c < rx.length; c++) if (!sameCell(rx[c], ry[c])) return false;
    }
  }
  return true;
}

function sameSpectrum(a: Spectrum, b: Spectrum): boolean {
  if (a === b) return true;
  if (!Object.is(a.f0, b.f0) || a.re.length !== b.re.length) return false;
  for (let n = 0; n < a.re.length; n++) if (!Object.is(a.re[n], b.re[n]) || !Object.is(a.im[n], b.im[n])) return false;
  return true;
}
