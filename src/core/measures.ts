/**
 * Measures of one spectrum (DESIGN §3 "Measures of a spectrum"): MEAN, RMS, THD, AT, TRACE, POWER, CREST.
 * PEAK, VALLEY and PP live in extremes.ts. Sums of squares use a power-of-two scale (no overflow or
 * underflow) and compensated (Neumaier) summation, so RMS and THD keep full precision at 10 000 harmonics.
 */
import { finite, numError, valueError } from './errors';
import { checkSpectrum, evalSeries, ExtremesOptions } from './extremes';
import { scaledExtremes } from './extremes-scaled';
import { evaluateOnGrid, fft } from './fft';
import { LIMITS } from './limits';
import { order, Spectrum } from './spectrum';

const TWO_PI = 2 * Math.PI;
// Module-level aliases: global lookups are slow inside some sandboxes (test runners, workbook engines).
const { abs, sqrt, cos, sin, floor, ceil, round, hypot, log2, max: mmax, min: mmin } = Math;

/** Signed mean (the DC term). */
export function mean(s: Spectrum): number {
  checkSpectrum(s);
  return s.re[0] + 0;
}

/** Power of two at or above |x|, so that dividing by it is exact. */
function pow2Above(x: number): number {
  if (!(x > 0)) return 1;
  let e = ceil(log2(x));
  if (2 ** e < x) e++;
  // 2^1024 is Infinity: above 2^1023 the scaled values stay below 2, their squares far from overflow.
  return 2 ** Math.min(e, 1023);
}

/**
 * Σ_{n=from..to} (re[n]² + im[n]²)·weight(n) as scale²·sum, computed on values divided by `scale`
 * (a power of two ≥ the largest magnitude) with Neumaier summation. weight is 1 for n = 0 and `w` above.
 */
function scaledSquares(s: Spectrum, from: number, to: number, scale: number, w: number): number {
  let sum = 0;
  let comp = 0;
  for (let n = from; n <= to; n++) {
    const a = s.re[n] / scale;
    const b = n === 0 ? 0 : s.im[n] / scale;
    const t = (n === 0 ? 1 : w) * (a * a + b * b);
    const u = sum + t;
    comp += abs(sum) >= t ? sum - u + t : t - u + sum;
    sum = u;
  }
  return sum + comp;
}

function largest(s: Spectrum, from: number, to: number): number {
  let big = 0;
  for (let n = from; n <= to; n++) big = mmax(big, abs(s.re[n]), n === 0 ? 0 : abs(s.im[n]));
  return big;
}

function finiteResult(x: number, what: string): number {
  if (!Number.isFinite(x)) throw numError(`${what} is too large to represent as a number.`);
  return x + 0;
}

/** RMS by Parseval: √(DC² + Σ|C_n|²/2); the AC part only when acOnly. */
export function rms(s: Spectrum, acOnly = false): number {
  checkSpectrum(s);
  if (typeof acOnly !== 'boolean') throw valueError('ac_only must be TRUE or FALSE.');
  const from = acOnly ? 1 : 0;
  const N = order(s);
  const scale = pow2Above(largest(s, from, N));
  return finiteResult(scale * sqrt(scaledSquares(s, from, N, scale, 0.5)), 'RMS');
}

export type ThdReference = 'fundamental' | 'rms';

/**
 * Total harmonic distortion, DC excluded: √Σ_{n≥2}|C_n|² over |C_1| (reference 'fundamental', default) or
 * over the AC RMS √Σ_{n≥1}|C_n|² (reference 'rms'). A ratio, not percent.
 */
export function thd(s: Spectrum, reference: ThdReference = 'fundamental'): number {
  checkSpectrum(s);
  const ref = typeof reference === 'string' ? reference.trim().toLowerCase() : reference;
  if (ref !== 'fundamental' && ref !== 'rms') {
    throw valueError(`reference must be "fundamental" or "rms", got ${JSON.stringify(reference)}.`);
  }
  const N = order(s);
  const fund = N >= 1 ? hypot(s.re[1], s.im[1]) : 0;
  const scale = pow2Above(largest(s, 1, N));
  const harm = N >= 2 ? sqrt(scaledSquares(s, 2, N, scale, 1)) : 0; // in units of scale
  if (ref === 'fundamental') {
    if (fund === 0) {
      throw numError('THD to the fundamental is undefined: the fundamental (n = 1) is zero. Use reference "rms", or a spectrum with a fundamental.');
    }
    const r = harm / (fund / scale); // fund/scale ≤ 1: no overflow on the way, only in a ratio that is too large
    if (!Number.isFinite(r)) throw numError('THD to the fundamental is too large to represent: the fundamental is negligible next to the harmonics.');
    return r;
  }
  const f = fund / scale;
  const ac = sqrt(harm * harm + f * f);
  if (ac === 0) throw numError('THD to the RMS is undefined: the waveform has no AC part (all harmonics are zero).');
  return harm / ac;
}

/** Time in periods reduced to a phase in [0, 2π). */
function phaseOf(time: number, f0: number): number {
  const u = time * f0;
  if (!Number.isFinite(u)) throw numError(`time ${time} s is beyond the number range in periods of ${f0} Hz.`);
  return TWO_PI * (u - floor(u));
}

/** x(t) at one time (seconds), with compensated summation over the harmonics. */
export function valueAt(s: Spectrum, time: number): number {
  checkSpectrum(s);
  finite(time, 'time');
  const N = order(s);
  if (N === 0) return s.re[0] + 0;
  const th = phaseOf(time, s.f0);
  const x = sumAt(s, th, 1);
  if (Number.isFinite(x)) return x + 0;
  // A partial sum or a product overflowed: sum again at 2^-64 scale (exact), so only a true value beyond
  // the number range is refused.
  return finiteResult(sumAt(s, th, 2 ** -64) * 2 ** 64, 'the value');
}

function sumAt(s: Spectrum, th: number, scale: number): number {
  const N = order(s);
  const c1 = cos(th);
  const s1 = sin(th);
  let sum = s.re[0] * scale;
  let comp = 0;
  let zr = 1;
  let zi = 0;
  for (let n = 1; n <= N; n++) {
    if ((n - 1) % 64 === 0) {
      zr = cos(n * th);
      zi = sin(n * th);
    } else {
      const t = zr * c1 - zi * s1;
      zi = zr * s1 + zi * c1;
      zr = t;
    }
    const v = s.re[n] * scale * zr - s.im[n] * scale * zi;
    const u = sum + v;
    comp += abs(sum) >= abs(v) ? sum - u + v : v - u + sum;
    sum = u;
  }
  return sum + comp;
}

export interface Trace {
  t: Float64Array;
  x: Float64Array;
}

/** Above this many harmonic-point products a trace uses FFTs instead of direct sums. */
const DIRECT_TRACE_WORK = 1 << 18;

function gcd(a: number, b: number): number {
  while (b) [a, b] = [b, a % b];
  return a;
}

/**
 * `points` samples of x(t) from t = 0 to t = periods/f0 inclusive (for a chart). Exact values at every
 * point: one FFT grid when the points fall on a whole-number grid per period, direct sums when the work is
 * small, otherwise a chirp-z transform.
 */
export function trace(s: Spectrum, points = 200, periods = 1): Trace {
  checkSpectrum(s);
  if (typeof points !== 'number' || Number.isNaN(points)) throw valueError('points must be a whole number.');
  if (!Number.isInteger(points) || points < 2 || points > LIMITS.tracePoints) {
    throw numError(`points must be a whole number from 2 to ${LIMITS.tracePoints}, got ${points}.`);
  }
  finite(periods, 'periods');
  if (!(periods > 0) || periods > LIMITS.tracePeriods) {
    throw numError(`periods must be > 0 and at most ${LIMITS.tracePeriods}, got ${periods}.`);
  }
  if (!(s.f0 > 0)) {
    throw numError('TRACE needs a spectrum with a fundamental frequency: a DC-only spectrum has no period to span. Use MEAN for its value.');
  }
  const N = order(s);
  const K = points;
  const T = 1 / s.f0;
  const t = new Float64Array(K);
  const x = new Float64Array(K);
  const step = periods / (K - 1); // periods per step
  for (let k = 0; k < K; k++) t[k] = ((k * periods) / (K - 1)) * T;
  if (!Number.isFinite(t[K - 1])) throw numError(`the trace's times exceed the number range: the period is ${T} s.`);

  if (N === 0) {
    x.fill(s.re[0] + 0);
    return { t, x };
  }
  if (!traceOnGrid(s, periods, K, x) && !(K * N <= DIRECT_TRACE_WORK && traceDirect(s, step, x))) {
    traceChirpZ(s, step, x);
  }
  for (let k = 0; k < K; k++) if (!Number.isFinite(x[k])) throw numError('the trace is too large to represent.');
  return { t, x };
}

/**
 * When periods = a/b with small b, the points are every j-th point of an M-point grid per period
 * (M ≥ 2N+1, M a multiple of the reduced denominator): one FFT, exact at the points.
 */
function traceOnGrid(s: Spectrum, periods: number, K: number, x: Float64Array): boolean {
  const N = order(s);
  for (let b = 1; b <= 16; b++) {
    const a = round(periods * b);
    if (a < 1 || abs(a - periods * b) > 1e-12 * periods * b) continue;
    // step = a / (b·(K−1)) periods = num/den in lowest terms.
    const g = gcd(a, b * (K - 1));
    const num = a / g;
    const den = (b * (K - 1)) / g;
    const c = ceil((2 * N + 1) / den);
    const M = den * c;
    if (M > 8 * (2 * N + 1) + 2 * K) return false;
    const grid = evaluateOnGrid(s, M);
    const jump = (num * c) % M;
    for (let k = 0, idx = 0; k < K; k++) {
      x[k] = grid[idx];
      idx += jump;
      if (idx >= M) idx -= M;
    }
    return true;
  }
  return false;
}

/** Direct sums, one rotation recurrence per point (no cosine per harmonic and point). */
function traceDirect(s: Spectrum, step: number, x: Float64Array): boolean {
  const N = order(s);
  const buf = new Float64Array(3);
  for (let k = 0; k < x.length; k++) {
    const u = k * step;
    evalSeries(s.re, s.im, N, TWO_PI * (u - floor(u)), buf);
    x[k] = buf[0];
  }
  return true;
}

/**
 * frac(r·m²/2) for integer m (m² < 2^31), exact to ~1e-15: r is split so that its high part times m² is
 * exact in double precision.
 */
function chirpPhase(rHi: number, rLo: number, m: number): number {
  const m2 = m * m;
  const p = (rHi * m2) / 2; // exact: rHi has ≤ 22 significant bits
  const q = (rLo * m2) / 2;
  const f = p - floor(p) + (q - floor(q));
  return f - floor(f);
}

/**
 * Chirp-z transform for x_k = Re Σ_n C_n W^{nk}, W = e^{j2πr}: with nk = (n² + k² − (k−n)²)/2 it is one
 * convolution, done by power-of-two FFTs.
 */
function traceChirpZ(s: Spectrum, step: number, x: Float64Array): void {
  const N = order(s);
  const K = x.length;
  const r = step - 2 * floor(step / 2); // W^{m²/2} has period 2 in r
  const rHi = round(r * 2 ** 20) / 2 ** 20;
  const rLo = r - rHi;
  const top = mmax(N, K);
  const wr = new Float64Array(top + 1);
  const wi = new Float64Array(top + 1);
  for (let m = 0; m <= top; m++) {
    const ph = TWO_PI * chirpPhase(rHi, rLo, m);
    wr[m] = cos(ph);
    wi[m] = sin(ph);
  }
  let L = 1;
  while (L < N + K) L *= 2;
  const ar = new Float64Array(L);
  const ai = new Float64Array(L);
  const br = new Float64Array(L);
  const bi = new Float64Array(L);
  // a_n = C_n W^{n²/2}; b_m = W^{−m²/2} for m = −N..K−1 (negative m wrapped to the end).
  for (let n = 0; n <= N; n++) {
    const cr = s.re[n];
    const ci = n === 0 ? 0 : s.im[n];
    ar[n] = cr * wr[n] - ci * wi[n];
    ai[n] = cr * wi[n] + ci * wr[n];
  }
  for (let m = 0; m < K; m++) {
    br[m] = wr[m];
    bi[m] = -wi[m];
  }
  for (let m = 1; m <= N; m++) {
    br[L - m] = wr[m];
    bi[L - m] = -wi[m];
  }
  fft(ar, ai);
  fft(br, bi);
  for (let i = 0; i < L; i++) {
    const pr = ar[i] * br[i] - ai[i] * bi[i];
    const pi = ar[i] * bi[i] + ai[i] * br[i];
    ar[i] = pr;
    ai[i] = pi;
  }
  fft(ar, ai, true);
  const inv = 1 / L;
  for (let k = 0; k < K; k++) {
    // X_k = W^{k²/2}·(a ∗ b)_k
    x[k] = (ar[k] * wr[k] - ai[k] * wi[k]) * inv;
  }
}

/**
 * Mean power of a voltage and a current spectrum: V0·I0 + Σ Re(V_n·conj(I_n))/2. Harmonics present in only
 * one spectrum contribute nothing; the two must share a fundamental frequency.
 */
export function power(v: Spectrum, i: Spectrum): number {
  checkSpectrum(v, 'voltage spectrum');
  checkSpectrum(i, 'current spectrum');
  const Nv = order(v);
  const Ni = order(i);
  const N = mmin(Nv, Ni);
  if (N >= 1 && abs(v.f0 - i.f0) > 1e-9 * mmax(v.f0, i.f0)) {
    throw numError(
      `the voltage spectrum's fundamental (${v.f0} Hz) differs from the current spectrum's (${i.f0} Hz); both must share one fundamental.`,
    );
  }
  let sum = v.re[0] * i.re[0];
  let comp = 0;
  for (let n = 1; n <= N; n++) {
    const t = 0.5 * v.re[n] * i.re[n] + 0.5 * v.im[n] * i.im[n]; // halves first: 1e308·2/2 stays finite
    const u = sum + t;
    comp += abs(sum) >= abs(t) ? sum - u + t : t - u + sum;
    sum = u;
  }
  return finiteResult(sum + comp, 'the mean power');
}

/** Crest factor: largest |x| over a period / RMS (extremes as in extremes.ts, jumps estimated by default). */
export function crest(s: Spectrum, opts?: ExtremesOptions): number {
  const r = rms(s);
  if (r === 0) throw numError('the crest factor is undefined for a zero waveform (its RMS is 0).');
  const e = scaledExtremes(s, opts);
  return finiteResult(mmax(abs(e.max), abs(e.min)) / r, 'the crest factor');
}
