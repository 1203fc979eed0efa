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

export function makeSpectrum(f0: number, harmonics: number): Spectrum {
  return { f0, re: new Float64Array(harmonics + 1), im: new Float64Array(harmonics + 1) };
}

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

/** The DESIGN §2 spectrum table: rows n = 0..N of [n, frequency Hz, amplitude (peak), phase deg]. */
export function spectrumToTable(s: Spectrum): number[][] {
  const N = order(s);
  if (N > 0 && !Number.isFinite(N * s.f0)) {
    throw numError(`the harmonic frequencies exceed the number range: ${N} × ${s.f0} Hz; lower the frequency or the harmonics.`);
  }
  let big = 0;
  for (let n = 0; n <= N; n++) big = Math.max(big, Math.hypot(s.re[n], s.im[n]));
  if (!Number.isFinite(big)) throw numError('an amplitude of the spectrum exceeds the number range (about 1.8e308); scale the inputs down.');
  const rows: number[][] = new Array(N + 1);
  for (let n = 0; n <= N; n++) {
    if (n === 0) {
      rows[0] = [0, 0, s.re[0] + 0, 0];
      continue;
    }
    const a = Math.hypot(s.re[n], s.im[n]);
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
  const rows: number[][] = [];
  let sawHeader = false;
  for (let r = 0; r < grid.length; r++) {
    const row = Array.isArray(grid[r]) ? (grid[r] as unknown[]) : [grid[r]];
    if (row.every(isBlank)) continue;
    if (row.length < 4) {
      throw valueError(`${what} must have 4 columns (n, frequency, amplitude, phase); row ${r + 1} has ${row.length}.`);
    }
    const cells = row.slice(0, 4);
    if (rows.length === 0 && !sawHeader && cells.some((c) => typeof c === 'string' && !isBlank(c) && Number.isNaN(numberFromText(c)))) {
      sawHeader = true; // one leading header row of text
      continue;
    }
    if (rows.length >= LIMITS.spectrumRows) {
      throw numError(`${what} has more than ${LIMITS.spectrumRows} data rows; at most ${LIMITS.spectrumRows} are allowed.`);
    }
    const nums = cells.map((c, k) => {
      const v = typeof c === 'string' && !isBlank(c) ? numberFromText(c) : c;
      if (typeof v !== 'number' || Number.isNaN(v)) {
        const why = rows.length > 0 || sawHeader ? ' (only one header row, at the top, is skipped)' : '';
        throw valueError(`${what}: row ${r + 1}, column ${k + 1} must be a number, got ${shown(c)}${why}.`);
      }
      if (!Number.isFinite(v)) throw numError(`${what}: row ${r + 1}, column ${k + 1} must be finite.`);
      return v;
    });
    for (let k = 4; k < row.length; k++) {
      if (!isBlank(row[k])) throw valueError(`${what} must have 4 columns (n, frequency, amplitude, phase); row ${r + 1} has more.`);
    }
    rows.push(nums);
  }
  if (rows.length === 0) {
    const header = sawHeader ? ' (its only row with text was taken for a header; numbers written as text must be plain decimals)' : '';
    throw valueError(`${what} holds no rows; expected rows [n, frequency, amplitude, phase]${header}.`);
  }

  let N = 0;
  let f0 = 0;
  for (const [n, f, a] of rows) {
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
  for (const [n, f] of rows) {
    if (n > 0 && Math.abs(f - n * f0) > 1e-9 * n * f0) {
      throw numError(`${what}: frequency ${f} Hz at n = ${n} is not n × the fundamental ${f0} Hz implied by the other rows.`);
    }
  }
  const s = makeSpectrum(f0, N);
  for (const [n, , a, ph] of rows) {
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
