import { numError } from './errors';
import { checkSpectrum, Extremes, extremes, ExtremesOptions } from './extremes';
import { Spectrum } from './spectrum';

/**
 * PEAK, VALLEY and PP (and the peaks behind CREST, STRESS and SPREAD) on any scale of amplitudes.
 * extremes.ts forms sums of squares and fourth powers of the coefficients (jump fits, error bounds), which
 * overflow or underflow far from unit scale (measured: a square wave's peak read 1.18 instead of 1 at
 * amplitudes of 1e180 and 1e-180). The spectrum is therefore scaled by a power of two, which is exact, so that
 * its largest coefficient lies in [0.5, 1), and the extremes are scaled back.
 */

/** x·2^k for any integer k in ±2200 without an intermediate overflow or underflow of 2^k itself. */
function ldexp(x: number, k: number): number {
  const h = Math.trunc(k / 2);
  return x * 2 ** h * 2 ** (k - h);
}

export function scaledExtremes(s: Spectrum, opts?: ExtremesOptions): Extremes {
  checkSpectrum(s);
  let big = 0;
  for (let n = 0; n < s.re.length; n++) {
    const a = Math.abs(s.re[n]);
    const b = n === 0 ? 0 : Math.abs(s.im[n]);
    if (a > big) big = a;
    if (b > big) big = b;
  }
  if (big === 0) return extremes(s, opts);
  let e = Math.floor(Math.log2(big));
  if (ldexp(big, -e) >= 2) e++; // log2 rounding near a power of two
  else if (ldexp(big, -e) < 1) e--;
  const k = -(e + 1); // big·2^k ∈ [0.5, 1)
  if (k === 0) return extremes(s, opts);
  const re = new Float64Array(s.re.length);
  const im = new Float64Array(s.im.length);
  for (let n = 0; n < re.length; n++) {
    re[n] = ldexp(s.re[n], k);
    im[n] = n === 0 ? 0 : ldexp(s.im[n], k);
  }
  const r = extremes({ f0: s.f0, re, im }, opts);
  const max = ldexp(r.max, -k);
  const min = ldexp(r.min, -k);
  if (!Number.isFinite(max) || !Number.isFinite(min)) {
    throw numError('the waveform reaches beyond the number range (about ±1.8e308); scale the amplitudes down.');
  }
  return { max: max + 0, tMax: r.tMax, min: min + 0, tMin: r.tMin };
}

/** Largest value over a period (HC.PEAK). */
export const peak = (s: Spectrum, opts?: ExtremesOptions): number => scaledExtremes(s, opts).max;
/** Smallest value over a period (HC.VALLEY). */
export const valley = (s: Spectrum, opts?: ExtremesOptions): number => scaledExtremes(s, opts).min;
/** PEAK − VALLEY (HC.PKPK); NUM when the difference exceeds the number range. */
export function pp(s: Spectrum, opts?: ExtremesOptions): number {
  const e = scaledExtremes(s, opts);
  const d = e.max - e.min;
  if (!Number.isFinite(d)) throw numError('the peak-to-peak value exceeds the number range (about 1.8e308); scale the amplitudes down.');
  return d;
}
