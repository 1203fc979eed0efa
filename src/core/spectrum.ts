import { HcError, numError, valueError } from './errors';
import { LIMITS } from './limits';

/**
 * A one-sided Fourier spectrum on the fundamental f0, held as phasors in typed arrays:
 *   x(t) = re[0] + Σ_{n=1..N} ( re[n]·cos(nωt) − im[n]·sin(nωt) ),  ω = 2π·f0,
 * i.e. x(t) = Re Σ C_n e^{jnωt} with C_n = re[n] + j·im[n] (peak amplitude, cosine reference).
 * re[0] is the signed mean and im[0] is 0. Phasors (not amplitude/phase) are kept so that a network
 * response is one complex multiply per harmonic.
 */
export interface Spectrum {
  f0: number;
  re: Float64Array;
  im: Float64Array;
}

/**
 * Spectra of up to SLAB_SHARE doubles are carved from shared zeroed slabs of SLAB doubles: a typed array above
 * 64 bytes is an off-heap allocation costing about 4 µs (more than a 200-harmonic response takes to solve),
 * where a slab costs that once for ten or more spectra. A slab lives while any spectrum cut from it does, so at
 * most SLAB doubles (32 kB) are held for one long-lived small spectrum; larger spectra get buffers of their own.
 */
const SLAB = 4096;
const SLAB_SHARE = SLAB / 8;
let slab = new Float64Array(0);
let slabUsed = 0;

/** A zero spectrum; re and im are two views of one buffer. */
export function makeSpectrum(f0: number, harmonics: number): Spectrum {
  const len = harmonics + 1;
  if (2 * len > SLAB_SHARE) {
    const both = new Float64Array(2 * len);
    return { f0, re: both.subarray(0, len), im: both.subarray(len) };
  }
  if (slabUsed + 2 * len > slab.length) {
    slab = new Float64Array(SLAB);
    slabUsed = 0;
  }
  const at = slabUsed;
  slabUsed += 2 * len;
  return { f0, re: slab.subarray(at, at + len), im: slab.subarray(at + len, at + 2 * len) };
}

/**
 * Math.hypot(x, y) bit for bit, without its cost (about 50 ns a call: it is not inlined and copies its
 * arguments). The same steps as V8's builtin (src/builtins/math.tq): divide by the larger magnitude, add the
 * squares with Kahan compensation, sqrt, multiply back. test/spectrum-fast.test.ts compares it with
 * Math.hypot over random and edge-case pairs, so a V8 that changes its algorithm fails there.
 */
export function hypot2(x: number, y: number): number {
  const ax = Math.abs(x);
  const ay = Math.abs(y);
  if (ax !== ax || ay !== ay) return ax === Infinity || ay === Infinity ? Infinity : NaN;
  const max = ax > ay ? ax : ay;
  if (max === Infinity) return Infinity;
  if (max === 0) return 0;
  const nx = ax / max;
  const ny = ay / max;
  // V8's Kahan summation over two terms: after the first the compensation is (nx² − 0) − nx² = 0 exactly.
  return Math.sqrt(nx * nx + ny * ny) * max;
}

/** Scratch for spectrumToTable's amplitudes and spectrumFromTable's numbers; grown as needed, never shrunk. */
let scratch = new Float64Array(1024);
const scratchOf = (n: number): Float64Array => (scratch.length >= n ? scratch : (scratch = new Float64Array(Math.max(n, 2 * scratch.length))));

/** Highest harmonic order N held by a spectrum. */
export const order = (s: Spectrum): number => s.re.length - 1;

/** Validate a harmonic count argument. */
export function checkHarmonics(n: number, what = 'harmonics'): number {
  if (typeof n !== 'number' || Number.isNaN(n)) throw valueError(`${what} must be a whole number of harmonics.`);
  if (!Number.isFinite(n) || n < 0 || Math.floor(n) !== n) {
    throw numError(`${what} must be a whole number from 0 to ${LIMITS.harmonics}, got ${n}.`);
  }
  if (n > LIMITS.harmonics) throw numError(`${what} is ${n}; at most ${LIMITS.harmonics} harmonics are allowed.`);
  return n;
}

/** Phase in degrees normalised to (−180, 180]; amplitudes below this fraction of the largest get phase 0. */
const PHASE_FLOOR = 1e-15;

function wrapDegrees(deg: number): number {
  let d = deg % 360;
  if (d <= -180) d += 360;
  else if (d > 180) d -= 360;
  return d;
}

/**
 * Every amplitude into `amp` (at least N + 1 long); returns the largest. Throws where the spectrum has no table
 * (a frequency or an amplitude beyond the number range), so a table can be promised before it is written.
 */
function amplitudes(s: Spectrum, amp: Float64Array): number {
  const N = order(s);
  if (N > 0 && !Number.isFinite(N * s.f0)) {
    throw numError(`the harmonic frequencies exceed the number range: ${N} × ${s.f0} Hz; lower the frequency or the harmonics.`);
  }
  let big = 0;
  for (let n = 0; n <= N; n++) {
    const a = hypot2(s.re[n], s.im[n]);
    amp[n] = a;
    big = Math.max(big, a);
  }
  if (!Number.isFinite(big)) throw numError('an amplitude of the spectrum exceeds the number range (about 1.8e308); scale the inputs down.');
  return big;
}

/** Throws the error spectrumToTable(s) would throw, if any; otherwise that table has only finite numbers. */
export function checkTableable(s: Spectrum): void {
  amplitudes(s, scratchOf(order(s) + 1));
}

/** The DESIGN §2 spectrum table: rows n = 0..N of [n, frequency Hz, amplitude (peak), phase deg]. */
export function spectrumToTable(s: Spectrum): number[][] {
  const N = order(s);
  const amp = scratchOf(N + 1);
  const big = amplitudes(s, amp);
  const rows: number[][] = new Array(N + 1);
  rows[0] = [0, 0, s.re[0] + 0, 0];
  for (let n = 1; n <= N; n++) {
    const a = amp[n];
    const ph = a > PHASE_FLOOR * big && a > 0 ? wrapDegrees((Math.atan2(s.im[n], s.re[n]) * 180) / Math.PI) : 0;
    rows[n] = [n, n * s.f0, a, ph + 0];
  }
  return rows;
}

const isBlank = (v: unknown): boolean => v === null || v === undefined || (typeof v === 'string' && v.trim() === '');

/** Numbers written as text in a table: decimal notation only (no hex, no "Infinity"). */
const DECIMAL_TEXT = /^\s*[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?\s*$/;
const numberFromText = (c: string): number => (c.length <= 64 && DECIMAL_TEXT.test(c) ? Number(c) : NaN);
const shown = (c: unknown): string => {
  const t = JSON.stringify(c) ?? String(c);
  return t.length > 40 ? `${t.slice(0, 37)}...` : t;
};

/**
 * Read a spectrum table (a range or nested array of [n, frequency, amplitude, phase] rows). One leading
 * row of text (headers) and blank rows are ignored; anything else that is not a number is rejected.
 * Harmonics may be missing or in any order; repeated n add as phasors. `what` names the argument.
 */
export function spectrumFromTable(grid: unknown, what = 'spectrum'): Spectrum {
  if (!Array.isArray(grid) || grid.length === 0) {
    throw valueError(`${what} must be a spectrum table of rows [n, frequency, amplitude, phase].`);
  }
  // Pass 1: the rows' numbers, four per data row, into scratch (no allocation per row).
  // At most min(rows, LIMITS.spectrumRows) data rows are stored: the buffer never grows during the pass.
  const buf = scratchOf(4 * Math.min(grid.length, LIMITS.spectrumRows));
  let count = 0;
  let sawHeader = false;
  for (let r = 0; r < grid.length; r++) {
    const row = Array.isArray(grid[r]) ? (grid[r] as unknown[]) : [grid[r]];
    const c0 = row[0];
    // A row starting with a number is not blank (the common case, checked first).
    if (typeof c0 !== 'number' && row.every(isBlank)) continue;
    if (row.length < 4) {
      throw valueError(`${what} must have 4 columns (n, frequency, amplitude, phase); row ${r + 1} has ${row.length}.`);
    }
    if (count === 0 && !sawHeader) {
      let header = false;
      for (let k = 0; k < 4; k++) {
        const c = row[k];
        if (typeof c === 'string' && !isBlank(c) && Number.isNaN(numberFromText(c))) header = true;
      }
      if (header) {
        sawHeader = true; // one leading header row of text
        continue;
      }
    }
    if (count >= LIMITS.spectrumRows) {
      throw numError(`${what} has more than ${LIMITS.spectrumRows} data rows; at most ${LIMITS.spectrumRows} are allowed.`);
    }
    for (let k = 0; k < 4; k++) {
      const c = row[k];
      const v = typeof c === 'number' ? c : typeof c === 'string' && !isBlank(c) ? numberFromText(c) : c;
      if (typeof v !== 'number' || Number.isNaN(v)) {
        const why = count > 0 || sawHeader ? ' (only one header row, at the top, is skipped)' : '';
        throw valueError(`${what}: row ${r + 1}, column ${k + 1} must be a number, got ${shown(c)}${why}.`);
      }
      if (!Number.isFinite(v)) throw numError(`${what}: row ${r + 1}, column ${k + 1} must be finite.`);
      buf[4 * count + k] = v;
    }
    for (let k = 4; k < row.length; k++) {
      if (!isBlank(row[k])) throw valueError(`${what} must have 4 columns (n, frequency, amplitude, phase); row ${r + 1} has more.`);
    }
    count++;
  }
  if (count === 0) {
    const header = sawHeader ? ' (its only row with text was taken for a header; numbers written as text must be plain decimals)' : '';
    throw valueError(`${what} holds no rows; expected rows [n, frequency, amplitude, phase]${header}.`);
  }

  let N = 0;
  let f0 = 0;
  for (let j = 0; j < 4 * count; j += 4) {
    const n = buf[j], f = buf[j + 1], a = buf[j + 2];
    if (n < 0 || Math.floor(n) !== n) throw numError(`${what}: n must be a whole number ≥ 0, got ${n}.`);
    if (n > LIMITS.harmonics) throw numError(`${what}: harmonic ${n} exceeds the limit of ${LIMITS.harmonics}.`);
    if (n > 0 && a < 0) throw numError(`${what}: amplitudes above DC are peak values ≥ 0, got ${a} at n = ${n}.`);
    if (n === 0 && f !== 0) throw numError(`${what}: the n = 0 (DC) row must have frequency 0, got ${f}.`);
    if (n > 0 && !(f > 0)) throw numError(`${what}: frequency must be > 0 for n = ${n}, got ${f}.`);
    if (n > 0 && f0 === 0) f0 = f / n;
    N = Math.max(N, n);
  }
  if (N > 0 && !Number.isFinite(1 / f0)) {
    throw numError(`${what}: the fundamental ${f0} Hz is too low to have a period within the number range.`);
  }
  if (!Number.isFinite(N * f0)) throw numError(`${what}: harmonic ${N} of ${f0} Hz exceeds the number range.`);
  for (let j = 0; j < 4 * count; j += 4) {
    const n = buf[j], f = buf[j + 1];
    if (n > 0 && Math.abs(f - n * f0) > 1e-9 * n * f0) {
      throw numError(`${what}: frequency ${f} Hz at n = ${n} is not n × the fundamental ${f0} Hz implied by the other rows.`);
    }
  }
  const s = makeSpectrum(f0, N);
  for (let j = 0; j < 4 * count; j += 4) {
    const n = buf[j], a = buf[j + 2], ph = buf[j + 3];
    const rad = (ph * Math.PI) / 180;
    if (n === 0) {
      // The DC row's amplitude is the signed mean (DESIGN §2); a phase of ±180 flips its sign.
      const w = Math.abs(wrapDegrees(ph));
      if (w > 1e-9 && w < 180 - 1e-9) {
        throw numError(`${what}: the DC (n = 0) row's phase must be 0 (or ±180 for a negative mean), got ${ph}.`);
      }
      s.re[0] += w > 90 ? -a : a;
    } else {
      s.re[n] += a * Math.cos(rad);
      s.im[n] += a * Math.sin(rad);
    }
  }
  for (let n = 0; n <= N; n++) {
    if (!Number.isFinite(s.re[n]) || !Number.isFinite(s.im[n])) {
      throw numError(`${what}: the rows for n = ${n} add up beyond the number range (about 1.8e308).`);
    }
  }
  return s;
}

export function isHcError(e: unknown): e is HcError {
  return e instanceof HcError;
}
