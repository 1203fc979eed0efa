/**
 * Largest and smallest value over one period of a waveform given by its spectrum (HC.PEAK, HC.VALLEY, HC.PP,
 * and the peaks behind HC.CREST and HC.STRESS).
 *
 * Continuous waveforms. The partial sum and its slope are sampled by two inverse FFTs on a power-of-two grid
 * of at least 8·N points per period. On each grid interval the cubic Hermite interpolant of those samples
 * places any interior extreme to within Σ n⁴|C_n|·h⁴/384 (its error bound); intervals are refined best first
 * by Newton's method on x′ = 0, safeguarded by bisection inside the sign-changing bracket, until no interval
 * left can beat the best value found. x, x′ and x″ come from a rotation recurrence for e^{jnθ}, re-seeded every
 * 64 harmonics (no cosine per harmonic). Result: the partial sum's own extremes to rounding (measured ≤ 1e-13
 * relative against a brute force on 10⁶ points).
 *
 * Waveforms with jumps. A partial sum overshoots each jump by (Si(π)/π − ½)·jump ≈ 8.95 % of it (Gibbs) at
 * any N, so by default the jumps are modelled instead of reporting the ringing. With d_n = jπn·C_n, a jump J
 * and a slope jump S at phase θ contribute e^{−jnθ}·(J − jS/n), the first two terms of the Fourier asymptotics.
 *  1. Detection (N ≥ 16): the mean |d_n|² over the top half of the harmonics is at least 0.3 of that over
 *     (N/8, N/2] — about 1 with jumps, at most 0.2 for 1/n² spectra such as a triangle or a rectified sine,
 *     which therefore never switch the model on and keep the partial sum's extremes.
 *  2. Location: peaks of a concentration kernel Σ w_n·Re(d_n e^{jnθ}), w_n a half-Hann taper.
 *  3. Fit: all J, S and θ together by Levenberg–Marquardt least squares over n ≥ N/4 (at most the top 1024
 *     harmonics), weights (n/N)²; later rounds add jumps found in the residual only while they pay.
 *  4. The exact spectra of the fitted unit sawtooths and kinks are subtracted. The remainder and its slope
 *     are continuous, so its partial sum converges without ringing. The estimate is that remainder plus the
 *     closed forms (piecewise linear and quadratic), searched as above piece by piece between the jumps, the
 *     one-sided limits at every jump included (the time returned is then the jump's).
 * Measured accuracy: square, pulse and sawtooth spectra ≤ 1e-12 of the amplitude for N ≥ 16 at any phase, also
 * with smooth ripple added; an edge followed by exponential settling (an R-C current) 1.4e-3 at N = 49, 1e-5 at
 * N = 500. Safety: the model is rejected, and the partial sum's extremes returned, when it leaves more than 5 %
 * of the tail energy unexplained, needs more than 24 jumps (or more than a quarter of the fitted harmonics),
 * or would move an extreme by more than the Gibbs overshoot of its jumps (unless it fits to rounding, as for
 * a pulse narrower than the harmonics resolve). Edges with a rise time the harmonics only partly resolve
 * (about 1/N of the period) are treated as continuous and keep the partial sum's overshoot (≤ 3 % measured).
 * `truncated: true` returns the partial sum's extremes, ringing included.
 */
import { HcError, numError, valueError } from './errors';
import { evaluateOnGrid } from './fft';
import { order, Spectrum } from './spectrum';

export interface Extremes {
  /** Largest value over one period, and a time in [0, 1/f0) where it occurs (s; the edge time for a limit). */
  max: number;
  tMax: number;
  /** Smallest value over one period, and its time (s). */
  min: number;
  tMin: number;
}

export interface ExtremesOptions {
  /** Extremes of the plain partial sum, Gibbs ringing included (default false: estimate the waveform's). */
  truncated?: boolean;
}

const PI = Math.PI;
const TWO_PI = 2 * PI;
// Module-level aliases: global lookups are slow inside some sandboxes (test runners, workbook engines).
const { abs, sqrt, cos, sin, floor, hypot, max: mmax, min: mmin } = Math;
const INF = 1 / 0;
const NAN = 0 / 0;
const isFinite_ = (x: number): boolean => x - x === 0;
/** Gibbs overshoot per unit jump: Si(π)/π − ½. */
export const GIBBS_OVERSHOOT = 0.0894898722360836;

/**
 * Work arrays reused from call to call: each typed array above 64 bytes is a separate allocation that costs
 * microseconds and loads the garbage collector, several times the arithmetic of a 200-harmonic search. The
 * searches never nest, so one array per purpose suffices. Contents are stale: every user writes before it reads.
 * Above POOL_MAX elements a call allocates its own (the work then dwarfs the allocation).
 */
const POOL_MAX = 1 << 15;
const pool = new Map<string, Float64Array>();
function scratch(purpose: string, size: number): Float64Array {
  if (size > POOL_MAX) return new Float64Array(size);
  let a = pool.get(purpose);
  if (!a || a.length < size) {
    a = new Float64Array(mmin(POOL_MAX, mmax(size, 2 * (a?.length ?? 0), 64)));
    pool.set(purpose, a);
  }
  return a;
}
const linkPool = { a: new Uint8Array(0) };
function scratchLinks(size: number): Uint8Array {
  if (size > POOL_MAX) return new Uint8Array(size);
  if (linkPool.a.length < size) linkPool.a = new Uint8Array(mmin(POOL_MAX, mmax(size, 2 * linkPool.a.length, 64)));
  return linkPool.a;
}

/* ------------------------------------------------------------------------------------------------------ */
/* Spectrum checks shared with measures.ts                                                                   */

/** Float64Array from any realm (a test runner's sandbox, a workbook engine's context). */
const isF64 = (a: unknown): a is Float64Array => Object.prototype.toString.call(a) === '[object Float64Array]';

/** Reject anything that is not a well-formed Spectrum; `what` names the argument. */
export function checkSpectrum(s: Spectrum, what = 'spectrum'): Spectrum {
  if (!s || typeof s !== 'object' || !isF64(s.re) || !isF64(s.im)) {
    throw valueError(`${what} must be a spectrum (rows n, frequency, amplitude, phase).`);
  }
  if (s.re.length === 0 || s.re.length !== s.im.length) {
    throw valueError(`${what} must hold at least the DC row, with matching real and imaginary parts.`);
  }
  if (typeof s.f0 !== 'number' || !isFinite_(s.f0) || s.f0 < 0) {
    throw numError(`${what}: the fundamental frequency must be a finite number ≥ 0 Hz, got ${s.f0}.`);
  }
  const N = s.re.length - 1;
  if (N > 0 && !(s.f0 > 0)) throw numError(`${what}: a spectrum with harmonics needs a fundamental frequency > 0 Hz.`);
  for (let n = 0; n <= N; n++) {
    if (!isFinite_(s.re[n]) || !isFinite_(s.im[n])) {
      throw numError(`${what}: the coefficient of harmonic ${n} is not a finite number.`);
    }
  }
  return s;
}

/* ------------------------------------------------------------------------------------------------------ */
/* Point evaluation                                                                                          */

/** Harmonics between exact re-seeds of the rotation recurrence (bounds its error growth to ~64 ulp). */
const RESEED = 64;

/**
 * x(θ), x′(θ), x″(θ) (derivatives in θ = ωt) of the partial sum re[0] + Σ Re((re[n] + j·im[n])·e^{jnθ}),
 * written to out[0..2]. Plain sums: the rounding is ~1e-16·Σ|C_n| per term.
 */
export function evalSeries(re: Float64Array, im: Float64Array, N: number, theta: number, out: Float64Array): void {
  const th = theta - TWO_PI * floor(theta / TWO_PI);
  const c1 = cos(th);
  const s1 = sin(th);
  let x = re[0];
  let d1 = 0;
  let d2 = 0;
  let zr = 1;
  let zi = 0;
  for (let n = 1; n <= N; n++) {
    if ((n - 1) % RESEED === 0) {
      zr = cos(n * th);
      zi = sin(n * th);
    } else {
      const t = zr * c1 - zi * s1;
      zi = zr * s1 + zi * c1;
      zr = t;
    }
    const a = re[n];
    const b = im[n];
    const wr = a * zr - b * zi;
    const wi = a * zi + b * zr;
    x += wr;
    d1 -= n * wi;
    d2 -= n * n * wr;
  }
  out[0] = x;
  out[1] = d1;
  out[2] = d2;
}

/** Power of two ≥ max(8·N, 64): the dense grid (points per period) for a partial sum of order N. */
export function gridSize(N: number): number {
  let P = 64;
  while (P < 8 * N) P *= 2;
  return P;
}

/* ------------------------------------------------------------------------------------------------------ */
/* The function whose extremes are searched: a partial sum plus closed-form jump and kink terms              */

/**
 * f(θ) = partial sum (re, im) + Σ_k [ size[k]·saw(φ_k) + bend[k]·kink(φ_k) ], φ_k = (θ − at[k]) mod 2π, with
 *   saw(φ)  = ½ − φ/2π            (Σ sin nφ/(πn): a jump of +1 at 0, zero mean; 0 at the jump itself),
 *   kink(φ) = −π/6 + φ/2 − φ²/4π   (−Σ cos nφ/(πn²): a slope jump of +1 at 0, continuous, zero mean).
 * `at` is sorted ascending in [0, 2π). Without jumps f is the partial sum itself.
 */
interface Model {
  re: Float64Array;
  im: Float64Array;
  N: number;
  at: Float64Array;
  size: Float64Array;
  bend: Float64Array;
}

const noJumps = (re: Float64Array, im: Float64Array, N: number): Model => ({
  re, im, N, at: new Float64Array(0), size: new Float64Array(0), bend: new Float64Array(0),
});

/** Adds the closed-form terms and their derivatives at θ to out (jump midpoint at a jump). */
function addClosedForms(m: Model, theta: number, out: Float64Array): void {
  const K = m.at.length;
  for (let k = 0; k < K; k++) {
    let phi = theta - m.at[k];
    if (phi < 0 || phi >= TWO_PI) phi -= TWO_PI * floor(phi / TWO_PI);
    const saw = phi === 0 ? 0 : 0.5 - phi / TWO_PI;
    const J = m.size[k];
    const S = m.bend[k];
    out[0] += J * saw + S * (-PI / 6 + phi / 2 - (phi * phi) / (2 * TWO_PI));
    out[1] += -J / TWO_PI + S * saw;
    out[2] += -S / TWO_PI;
  }
}

/** f, f′, f″ at θ into out (at a jump: the midpoint value, and the mean of the one-sided slopes). */
function evalModel(m: Model, theta: number, out: Float64Array): void {
  evalSeries(m.re, m.im, m.N, theta, out);
  if (m.at.length > 0) addClosedForms(m, theta, out);
}

/* ------------------------------------------------------------------------------------------------------ */
/* Search                                                                                                    */

interface Found {
  value: number;
  theta: number;
}

/** Safeguarded Newton for σf′ = 0 on [lo, hi] with σf′(lo) > 0 > σf′(hi), from x; updates best. */
function newtonMax(m: Model, sigma: number, lo: number, hi: number, x: number, buf: Float64Array, best: Found): void {
  if (!(x > lo && x < hi)) x = 0.5 * (lo + hi);
  for (let it = 0; it < 100; it++) {
    evalModel(m, x, buf);
    const f = buf[0];
    const g = sigma * buf[1];
    const h = sigma * buf[2];
    if (sigma * f > sigma * best.value) {
      best.value = f;
      best.theta = x;
    }
    if (g > 0) lo = x;
    else if (g < 0) hi = x;
    else return;
    let next = h < 0 ? x - g / h : NAN;
    if (!(next > lo && next < hi)) next = 0.5 * (lo + hi);
    const step = abs(next - x);
    if (step <= 1e-14 * (1 + abs(x)) || hi - lo <= 1e-14 * (1 + abs(x))) {
      if (step > 0) {
        evalModel(m, next, buf);
        if (sigma * buf[0] > sigma * best.value) {
          best.value = buf[0];
          best.theta = next;
        }
      }
      return;
    }
    x = next;
  }
}

/**
 * Maximum of σ·f on [a, b] when the end slopes do not bracket it (σf′ has the same sign at both ends but
 * the interpolant shows an interior max-min pair): sample, then Newton inside the first sign change.
 */
function searchInterval(m: Model, sigma: number, a: number, b: number, ga: number, gb: number, buf: Float64Array, best: Found): void {
  // Only interior points are evaluated (an end may be a jump, whose one-sided slopes are ga and gb).
  const S = 16;
  let prevT = a;
  let prevG = ga;
  for (let i = 1; i <= S; i++) {
    const t = i < S ? a + ((b - a) * i) / S : b;
    let gt = gb;
    if (i < S) {
      evalModel(m, t, buf);
      if (sigma * buf[0] > sigma * best.value) {
        best.value = buf[0];
        best.theta = t;
      }
      gt = sigma * buf[1];
    }
    if (prevG > 0 && gt < 0) {
      newtonMax(m, sigma, prevT, t, 0.5 * (prevT + t), buf, best);
      return;
    }
    prevT = t;
    prevG = gt;
  }
}

/**
 * Largest interior local maximum of σ·H on (0, 1), H the cubic Hermite interpolant of f on [a, b]
 * (values fa, fb, slopes ga, gb in θ units, length L): returns σ·H there and the argument in s,
 * or −Infinity when σ·H has no interior local maximum.
 */
function hermiteMax(sigma: number, fa: number, ga: number, fb: number, gb: number, L: number, at: Float64Array): number {
  const sa = sigma * ga;
  const sb = sigma * gb;
  // σH′ runs from L·σga to L·σgb and is quadratic: rising through zero at both ends means at most a minimum.
  if (sa <= 0 && sb >= 0) return -INF;
  const c1 = L * sa;
  const c2 = sigma * (3 * (fb - fa)) - L * (2 * sa + sb);
  const c3 = sigma * (2 * (fa - fb)) + L * (sa + sb);
  // Roots of σH′(s) = c1 + 2c2·s + 3c3·s²; a maximum where σH″ = 2c2 + 6c3·s < 0.
  const A = 3 * c3;
  const B = 2 * c2;
  let r1 = NAN;
  let r2 = NAN;
  if (abs(A) <= 1e-14 * (abs(B) + abs(c1))) {
    if (B !== 0) r1 = -c1 / B;
  } else {
    const disc = B * B - 4 * A * c1;
    if (disc < 0) return -INF;
    const q = -0.5 * (B + (B >= 0 ? sqrt(disc) : -sqrt(disc)));
    if (q !== 0) r1 = c1 / q;
    r2 = q / A;
  }
  let best = -INF;
  if (r1 > 0 && r1 < 1 && B + 2 * A * r1 < 0) {
    best = sigma * fa + r1 * (c1 + r1 * (c2 + r1 * c3));
    at[0] = r1;
  }
  if (r2 > 0 && r2 < 1 && B + 2 * A * r2 < 0) {
    const v = sigma * fa + r2 * (c1 + r2 * (c2 + r2 * c3));
    if (v > best) {
      best = v;
      at[0] = r2;
    }
  }
  return best;
}

interface Scan {
  max: number;
  thMax: number;
  min: number;
  thMin: number;
}

/**
 * Extremes of the model over one period. Values and slopes on a dense grid (two inverse FFTs); jumps split
 * the period into pieces whose end samples are the one-sided limits. On each sample interval the cubic
 * Hermite interpolant locates interior extremes to within Σ n⁴|C_n|·L⁴/384 (its error bound); intervals
 * are refined best first (Newton on f′), and the search stops when no remaining interval can beat the best
 * value found by more than that bound.
 */
function scanModel(m: Model): Scan {
  const { re, im, N } = m;
  const K = m.at.length;
  let m4 = 0;
  let m0 = abs(re[0]);
  for (let n = 1; n <= N; n++) {
    // |C_n| only bounds the search: sqrt is enough (and ~10× cheaper than hypot) unless a square overflows.
    let a = sqrt(re[n] * re[n] + im[n] * im[n]);
    if (!(a < INF)) a = hypot(re[n], im[n]);
    m4 += n * n * n * n * a;
    m0 += a;
  }
  for (let k = 0; k < K; k++) m0 += abs(m.size[k]);
  if (m4 === 0 && K === 0) return { max: re[0], thMax: 0, min: re[0], thMin: 0 };

  const P = gridSize(N);
  const h = TWO_PI / P;
  const val = evaluateOnGrid({ f0: 1, re, im }, P, scratch('val', P));
  // exact lengths: evaluateOnGrid reads the order from them
  const dre = scratch('dre', N + 1).subarray(0, N + 1);
  const dim = scratch('dim', N + 1).subarray(0, N + 1);
  dre[0] = 0;
  dim[0] = 0;
  for (let n = 1; n <= N; n++) {
    dre[n] = -n * im[n];
    dim[n] = n * re[n];
  }
  const der = evaluateOnGrid({ f0: 1, re: dre, im: dim }, P, scratch('der', P));

  // Sample sequence: positions, values, slopes; link[i] = 1 when (i, i+1) is an interval of one piece.
  const L = K === 0 ? P + 1 : P + 2 * K;
  const pos = scratch('pos', L);
  const fv = scratch('fv', L);
  const fd = scratch('fd', L);
  const link = scratchLinks(L);
  let count = 0;
  if (K === 0) {
    for (let i = 0; i <= P; i++) {
      const g = i < P ? i : 0; // i % P, without an integer division per sample
      pos[i] = i * h;
      fv[i] = val[g];
      fd[i] = der[g];
      link[i] = i < P ? 1 : 0;
    }
    count = P + 1;
  } else {
    const buf = new Float64Array(3);
    for (let i = 0; i < P; i++) {
      buf[0] = 0;
      buf[1] = 0;
      addClosedForms(m, i * h, buf);
      val[i] += buf[0];
      der[i] += buf[1];
    }
    const limMid = new Float64Array(K);
    const limDer = new Float64Array(K);
    for (let k = 0; k < K; k++) {
      evalModel(m, m.at[k], buf);
      limMid[k] = buf[0];
      limDer[k] = buf[1];
    }
    for (let k = 0; k < K; k++) {
      const a0 = m.at[k];
      const k1 = (k + 1) % K;
      const a1 = k + 1 < K ? m.at[k + 1] : m.at[0] + TWO_PI;
      // One-sided limits: the kink's slope is ±½ on either side of its own jump.
      pos[count] = a0;
      fv[count] = limMid[k] + 0.5 * m.size[k];
      fd[count] = limDer[k] + 0.5 * m.bend[k];
      link[count++] = 1;
      for (let i = floor(a0 / h) + 1; i * h < a1; i++) {
        pos[count] = i * h;
        const g = i < P ? i : i - P; // i % P (i < 2P here)
        fv[count] = val[g];
        fd[count] = der[g];
        link[count++] = 1;
      }
      pos[count] = a1;
      fv[count] = limMid[k1] - 0.5 * m.size[k1];
      fd[count] = limDer[k1] - 0.5 * m.bend[k1];
      link[count++] = 0;
    }
  }

  // Extremes of the samples, and the widest interval (link[count − 1] is always 0).
  const res: Scan = { max: -INF, thMax: 0, min: INF, thMin: 0 };
  let hMax = h;
  for (let i = 0; i < count; i++) {
    const v = fv[i];
    if (v > res.max) { res.max = v; res.thMax = pos[i]; }
    if (v < res.min) { res.min = v; res.thMin = pos[i]; }
    if (link[i]) hMax = mmax(hMax, pos[i + 1] - pos[i]);
  }
  // What refinement can still gain over an interval's Hermite estimate, and the rounding floor of the sums:
  // an interval is refined only when it could beat the best value by more than that floor.
  const bound = (m4 * hMax ** 4) / 384;
  const noise = 1e-13 * m0;
  const buf = new Float64Array(3);
  const best: Found = { value: 0, theta: 0 };
  const sArg = new Float64Array(1);
  const cand: number[] = [];
  const est = scratch('est', count);
  const arg = scratch('arg', count);
  // Cheap screen for both searches in one pass: on [0, 1] the Hermite basis gives
  // σH ≤ max(σf_a, σf_b) + (4/27)·len·(|g_a| + |g_b|); only intervals that could pass the test below remain.
  const upFloor = res.max + noise - bound;
  const downFloor = -res.min + noise - bound;
  const screenedUp: number[] = [];
  const screenedDown: number[] = [];
  for (let i = 0; i + 1 < count; i++) {
    if (!link[i]) continue;
    const fa = fv[i], fb = fv[i + 1];
    const slack = (4 / 27) * (pos[i + 1] - pos[i]) * (abs(fd[i]) + abs(fd[i + 1]));
    const up = (fa > fb ? fa : fb) + slack;
    const down = -(fa < fb ? fa : fb) + slack;
    // margin: hermiteMax rounds too
    if (up + 1e-14 * abs(up) > upFloor) screenedUp.push(i);
    if (down + 1e-14 * abs(down) > downFloor) screenedDown.push(i);
  }

  for (const sigma of [1, -1]) {
    let top = sigma > 0 ? res.max : -res.min;
    cand.length = 0;
    for (const i of sigma > 0 ? screenedUp : screenedDown) {
      const len = pos[i + 1] - pos[i];
      const e = hermiteMax(sigma, fv[i], fd[i], fv[i + 1], fd[i + 1], len, sArg);
      if (e + bound > top + noise) {
        est[i] = e;
        arg[i] = pos[i] + sArg[0] * len;
        cand.push(i);
      }
    }
    cand.sort((p, q) => est[q] - est[p]);
    for (const i of cand) {
      if (est[i] + bound <= top + noise) break;
      best.value = sigma * top;
      best.theta = sigma > 0 ? res.thMax : res.thMin;
      const ga = sigma * fd[i];
      const gb = sigma * fd[i + 1];
      if (ga > 0 && gb < 0) newtonMax(m, sigma, pos[i], pos[i + 1], arg[i], buf, best);
      else searchInterval(m, sigma, pos[i], pos[i + 1], ga, gb, buf, best);
      if (sigma * best.value > top) {
        top = sigma * best.value;
        if (sigma > 0) { res.max = best.value; res.thMax = best.theta; }
        else { res.min = best.value; res.thMin = best.theta; }
      }
    }
  }
  res.thMax -= TWO_PI * floor(res.thMax / TWO_PI);
  res.thMin -= TWO_PI * floor(res.thMin / TWO_PI);
  return res;
}

/* ------------------------------------------------------------------------------------------------------ */
/* Jump estimation                                                                                           */

/** Below this order the tail is too short to tell jumps from smooth features. */
const MIN_JUMP_ORDER = 16;
/**
 * Mean |d_n|² over the top half of the harmonics relative to that over (N/8, N/2]: about 1 with jumps
 * (≥ 0.35 even for a 1 % pulse), 1/8 for 1/n² spectra (≤ 0.2 for a triangle or rectified sine at any N ≥ 16).
 */
const JUMP_TAIL_RATIO = 0.3;
/** A fitted model must explain all but this fraction of the tail energy. */
const MAX_UNEXPLAINED = 0.05;
/** A fit this close is exact up to rounding: the waveform is jumps plus a band-limited part. */
const EXACT_FIT = 1e-9;
/** Bounds on the model's size, so that a fit costs at most a few tens of milliseconds. */
const MAX_JUMPS = 24;
/**
 * Jumps below this fraction of the largest are dropped: their ringing (≤ 9 % of them) is negligible, and
 * such small fitted jumps are more often a smooth part leaking into the fit than a real edge.
 */
const DROP_JUMP = 1e-3;
const MAX_FIT_BAND = 1024;

export interface Jumps {
  /** Jump phases θ = ωt in [0, 2π), ascending. */
  at: Float64Array;
  /** Jump sizes: value just after minus value just before. */
  size: Float64Array;
  /** Slope jumps at the same places, in value per radian of ωt: slope just after minus just before. */
  bend: Float64Array;
  /** Fraction of the tail energy (n ≥ N/4) the fitted model leaves unexplained. */
  unexplained: number;
}

/** Mean of |z|² over n in (from, to]. */
function bandEnergy(zr: Float64Array, zi: Float64Array, from: number, to: number): number {
  let e = 0;
  for (let n = from + 1; n <= to; n++) e += zr[n] * zr[n] + zi[n] * zi[n];
  return to > from ? e / (to - from) : 0;
}

/** True when the coefficients d_n (= jπn·C_n) keep their level over the top harmonics, as jumps make them. */
function looksLikeJumps(dr: Float64Array, di: Float64Array, N: number, minLevel: number): boolean {
  const q = floor(N / 8);
  const hlf = floor(N / 2);
  const eU = bandEnergy(dr, di, hlf, N);
  const eM = bandEnergy(dr, di, q, hlf);
  if (!(eU > 0) || eU < JUMP_TAIL_RATIO * eM) return false;
  if (sqrt(eU) < minLevel) return false;
  // Jumps fill the tail broadly; a few isolated high tones do not.
  let big = 0;
  for (let n = hlf + 1; n <= N; n++) big = mmax(big, dr[n] * dr[n] + di[n] * di[n]);
  let count = 0;
  for (let n = hlf + 1; n <= N; n++) if (dr[n] * dr[n] + di[n] * di[n] >= 1e-6 * big) count++;
  return count >= mmax(3, 0.04 * (N - hlf));
}

/**
 * Jump function estimate G(θ) = Σ w_n Re(e_n e^{jnθ}) / Σ w_n on the grid, w_n = cos²(πn / 2(N+1)) (the
 * low-pass half of a Hann window): ≈ J at a jump J, a main lobe of half width 2π/N and side lobes below 5 %.
 * (Weights vanishing at n = 0 would suppress smooth parts better but make the kernel ring.)
 */
function concentration(er: Float64Array, ei: Float64Array, N: number, P: number, out: Float64Array): Float64Array {
  const re = scratch('cre', N + 1).subarray(0, N + 1);
  const im = scratch('cim', N + 1).subarray(0, N + 1);
  re[0] = 0;
  im[0] = 0;
  let sw = 0;
  for (let n = 1; n <= N; n++) {
    const c = cos((PI * n) / (2 * (N + 1)));
    const w = c * c;
    sw += w;
    re[n] = w * er[n];
    im[n] = w * ei[n];
  }
  const g = evaluateOnGrid({ f0: 1, re, im }, P, out);
  const inv = 1 / sw;
  for (let i = 0; i < P; i++) g[i] *= inv;
  return g;
}

/** Rotation recurrence for E_k(n) = e^{−jnθ_k}, k = 0..K−1, re-seeded every RESEED harmonics. */
class Phasors {
  readonly er: Float64Array;
  readonly ei: Float64Array;
  private readonly cr: Float64Array;
  private readonly ci: Float64Array;
  private th: Float64Array;
  private start = 0;
  constructor(K: number) {
    this.er = new Float64Array(K);
    this.ei = new Float64Array(K);
    this.cr = new Float64Array(K);
    this.ci = new Float64Array(K);
    this.th = this.er;
  }
  /** Prepare for n = from, from+1, …; call at(n) for each n in turn. */
  begin(th: Float64Array, from: number): void {
    this.th = th;
    this.start = from;
    for (let k = 0; k < th.length; k++) {
      this.cr[k] = cos(th[k]);
      this.ci[k] = -sin(th[k]);
    }
  }
  at(n: number): void {
    const { er, ei, cr, ci, th } = this;
    if ((n - this.start) % RESEED === 0) {
      for (let k = 0; k < th.length; k++) {
        er[k] = cos(n * th[k]);
        ei[k] = -sin(n * th[k]);
      }
    } else {
      for (let k = 0; k < th.length; k++) {
        const t = er[k] * cr[k] - ei[k] * ci[k];
        ei[k] = er[k] * ci[k] + ei[k] * cr[k];
        er[k] = t;
      }
    }
  }
}

/**
 * Least-squares fit of d_n ≈ Σ_k e^{−jnθ_k}(J_k − j·S_k/n) over n in [nLo, N] with weights (n/N)²: jumps J,
 * slope jumps S and places θ together (Levenberg–Marquardt; the 1/n term is the next order of the Fourier
 * asymptotics, so an exponential settling after an edge does not bias the edge). Updates p in place
 * (p = [J…, S…, θ…]).
 */
function fitJumps(dr: Float64Array, di: Float64Array, N: number, nLo: number, p: Float64Array): void {
  const K = p.length / 3;
  const D = 3 * K;
  const A = new Float64Array(D * D);
  const g = new Float64Array(D);
  const M = new Float64Array(D * D);
  const delta = new Float64Array(D);
  const pr = new Float64Array(D); // ∂r_n/∂p, real and imaginary parts
  const pim = new Float64Array(D);
  const trial = new Float64Array(D);
  const E = new Phasors(K);
  const invN2 = 1 / (N * N);

  const cost = (q: Float64Array): number => {
    E.begin(q.subarray(2 * K), nLo);
    let F = 0;
    for (let n = nLo; n <= N; n++) {
      E.at(n);
      let rr = dr[n];
      let ri = di[n];
      for (let k = 0; k < K; k++) {
        const J = q[k];
        const s = q[K + k] / n;
        rr -= E.er[k] * J + E.ei[k] * s;
        ri -= E.ei[k] * J - E.er[k] * s;
      }
      F += n * n * invN2 * (rr * rr + ri * ri);
    }
    return F;
  };

  let F = cost(p);
  let energy = 0;
  for (let n = nLo; n <= N; n++) energy += n * n * invN2 * (dr[n] * dr[n] + di[n] * di[n]);
  const floorF = (1e-15 * N) ** 2 * energy; // the phases nθ carry ~N ulp of rounding
  let lambda = 1e-3;
  for (let iter = 0; iter < 30 && F > floorF; iter++) {
    // A model that still leaves a quarter of the tail unexplained after a few steps will be rejected anyway.
    if (iter >= 4 && F > 0.25 * energy) return;
    A.fill(0);
    g.fill(0);
    E.begin(p.subarray(2 * K), nLo);
    for (let n = nLo; n <= N; n++) {
      E.at(n);
      const w = n * n * invN2;
      let rr = dr[n];
      let ri = di[n];
      for (let k = 0; k < K; k++) {
        const er = E.er[k];
        const ei = E.ei[k];
        const J = p[k];
        const S = p[K + k];
        const s = S / n;
        rr -= er * J + ei * s;
        ri -= ei * J - er * s;
        // r = d − E(J − jS/n): ∂r/∂J = −E, ∂r/∂S = jE/n, ∂r/∂θ = E(S + jnJ).
        pr[k] = -er;
        pim[k] = -ei;
        pr[K + k] = -ei / n;
        pim[K + k] = er / n;
        pr[2 * K + k] = er * S - ei * n * J;
        pim[2 * K + k] = ei * S + er * n * J;
      }
      for (let a = 0; a < D; a++) {
        const xa = w * pr[a];
        const ya = w * pim[a];
        g[a] -= xa * rr + ya * ri;
        for (let b = a; b < D; b++) A[a * D + b] += xa * pr[b] + ya * pim[b];
      }
    }
    for (let a = 0; a < D; a++) for (let b = 0; b < a; b++) A[a * D + b] = A[b * D + a];

    let improved = false;
    for (let tries = 0; tries < 12 && !improved; tries++) {
      M.set(A);
      for (let a = 0; a < D; a++) M[a * D + a] += lambda * A[a * D + a] + 1e-300;
      if (!choleskySolve(M, g, delta, D)) {
        lambda *= 10;
        continue;
      }
      for (let a = 0; a < D; a++) trial[a] = p[a] + delta[a];
      const F2 = cost(trial);
      if (F2 < F) {
        improved = true;
        const rel = (F - F2) / F;
        p.set(trial);
        F = F2;
        lambda = mmax(lambda / 10, 1e-12);
        let maxStep = 0;
        for (let k = 0; k < K; k++) maxStep = mmax(maxStep, abs(delta[2 * K + k]));
        if (rel < 1e-12 || (rel < 1e-6 && maxStep * N < 1e-7)) return;
      } else lambda *= 10;
    }
    if (!improved) return;
  }
}

/** Solve M·x = b (M symmetric positive definite, overwritten by its Cholesky factor). */
function choleskySolve(M: Float64Array, b: Float64Array, x: Float64Array, D: number): boolean {
  for (let j = 0; j < D; j++) {
    let s = M[j * D + j];
    for (let k = 0; k < j; k++) s -= M[j * D + k] * M[j * D + k];
    if (!(s > 0)) return false;
    const l = sqrt(s);
    M[j * D + j] = l;
    for (let i = j + 1; i < D; i++) {
      let t = M[i * D + j];
      for (let k = 0; k < j; k++) t -= M[i * D + k] * M[j * D + k];
      M[i * D + j] = t / l;
    }
  }
  for (let i = 0; i < D; i++) {
    let t = b[i];
    for (let k = 0; k < i; k++) t -= M[i * D + k] * x[k];
    x[i] = t / M[i * D + i];
  }
  for (let i = D - 1; i >= 0; i--) {
    let t = x[i];
    for (let k = i + 1; k < D; k++) t -= M[k * D + i] * x[k];
    x[i] = t / M[i * D + i];
  }
  for (let i = 0; i < D; i++) if (!isFinite_(x[i])) return false;
  return true;
}

/** e_n = d_n − Σ_k e^{−jnθ_k}(J_k − jS_k/n) for n = 1..N. */
function residual(dr: Float64Array, di: Float64Array, N: number, p: Float64Array, outR: Float64Array, outI: Float64Array): void {
  const K = p.length / 3;
  const E = new Phasors(K);
  E.begin(p.subarray(2 * K), 1);
  outR[0] = 0;
  outI[0] = 0;
  for (let n = 1; n <= N; n++) {
    E.at(n);
    let rr = dr[n];
    let ri = di[n];
    for (let k = 0; k < K; k++) {
      const s = p[K + k] / n;
      rr -= E.er[k] * p[k] + E.ei[k] * s;
      ri -= E.ei[k] * p[k] - E.er[k] * s;
    }
    outR[n] = rr;
    outI[n] = ri;
  }
}

const maxAbs = (a: Float64Array): number => {
  let m = 0;
  for (let k = 0; k < a.length; k++) m = mmax(m, abs(a[k]));
  return m;
};

function circDist(a: number, b: number): number {
  const d = abs(a - b) % TWO_PI;
  return mmin(d, TWO_PI - d);
}

/** Parameters [J…, S…, θ…] from lists. */
function pack(J: ArrayLike<number>, S: ArrayLike<number>, th: ArrayLike<number>): Float64Array {
  const K = J.length;
  const p = new Float64Array(3 * K);
  for (let k = 0; k < K; k++) {
    p[k] = J[k];
    p[K + k] = S[k];
    p[2 * K + k] = th[k];
  }
  return p;
}

/**
 * Wrap phases into [0, 2π), sort, merge jumps that converged onto one place and drop negligible ones.
 * Returns the (possibly shorter) parameter vector.
 */
function tidy(p: Float64Array, N: number): Float64Array {
  const K = p.length / 3;
  const big = maxAbs(p.subarray(0, K));
  const th = Array.from(p.subarray(2 * K), (t) => t - TWO_PI * floor(t / TWO_PI));
  const idx = th.map((_, k) => k).sort((a, b) => th[a] - th[b]);
  const J: number[] = [];
  const S: number[] = [];
  const at: number[] = [];
  for (const k of idx) {
    if (!(abs(p[k]) > DROP_JUMP * big)) continue;
    const last = at.length - 1;
    if (last >= 0 && circDist(at[last], th[k]) < 1e-3 / N) {
      J[last] += p[k];
      S[last] += p[K + k];
      continue;
    }
    J.push(p[k]);
    S.push(p[K + k]);
    at.push(th[k]);
  }
  if (at.length > 1 && circDist(at[0], at[at.length - 1]) < 1e-3 / N) {
    J[0] += J.pop() as number;
    S[0] += S.pop() as number;
    at.pop();
  }
  return pack(J, S, at);
}

/**
 * Estimate the jumps of the waveform behind a spectrum, or null when the spectrum does not look like one
 * with jumps or no jump model explains its tail. Exported for diagnostics and tests.
 */
export function findJumps(s: Spectrum): Jumps | null {
  const N = order(s);
  if (N < MIN_JUMP_ORDER) return null;
  const dr = scratch('dr', N + 1);
  const di = scratch('di', N + 1);
  dr[0] = 0;
  di[0] = 0;
  let ac = 0;
  for (let n = 1; n <= N; n++) {
    dr[n] = -PI * n * s.im[n];
    di[n] = PI * n * s.re[n];
    ac += s.re[n] * s.re[n] + s.im[n] * s.im[n];
  }
  if (!looksLikeJumps(dr, di, N, 1e-8 * sqrt(ac / 2))) return null;

  const nLo = mmax(1, floor(N / 4), N - MAX_FIT_BAND + 1);
  // At least 4 harmonics (8 real values) per jump's 3 parameters.
  const maxJumps = mmin(MAX_JUMPS, floor((N - nLo + 1) / 4));
  const P = gridSize(N);
  const G = scratch('G', P);
  const er = scratch('er', N + 1);
  const ei = scratch('ei', N + 1);
  er.set(dr.subarray(0, N + 1));
  ei.set(di.subarray(0, N + 1));
  let p: Float64Array = new Float64Array(0);
  const sep = (1.5 * TWO_PI) / N; // beyond the kernel's main lobe: closer peaks are one feature
  const unexplainedBy = (q: Float64Array): number => {
    residual(dr, di, N, q, er, ei);
    let eRes = 0;
    let eAll = 0;
    for (let n = nLo; n <= N; n++) {
      eRes += er[n] * er[n] + ei[n] * ei[n];
      eAll += dr[n] * dr[n] + di[n] * di[n];
    }
    return eAll > 0 ? eRes / eAll : 1;
  };
  let unexplained = 1;

  for (let round = 0; round < 4; round++) {
    const K = p.length / 3;
    if (K >= maxJumps) break;
    // Chase further jumps only while the residual still looks like jumps of some size.
    if (round > 0 && !looksLikeJumps(er, ei, N, DROP_JUMP * maxAbs(p.subarray(0, K)))) break;
    concentration(er, ei, N, P, G);
    let gBig = 0;
    for (let i = 0; i < P; i++) gBig = mmax(gBig, abs(G[i]));
    if (!(gBig > 0)) break;
    const found: { at: number; size: number }[] = [];
    for (let i = 0; i < P; i++) {
      const v = abs(G[i]);
      if (v < 0.2 * gBig) continue;
      const vp = abs(G[(i + P - 1) % P]);
      const vn = abs(G[(i + 1) % P]);
      if (!(v >= vp && v > vn)) continue;
      const den = vp - 2 * v + vn; // parabolic interpolation of the peak
      const off = den < 0 ? (0.5 * (vp - vn)) / den : 0;
      const t = ((i + off) * TWO_PI) / P;
      let near = false;
      for (let k = 0; k < K; k++) if (circDist(t, p[2 * K + k]) < sep) near = true;
      if (!near) found.push({ at: t, size: G[i] });
    }
    if (found.length === 0) break;
    // More edges than the tail can pin down: not a waveform this model can describe.
    if (round === 0 && found.length > maxJumps) return null;
    found.sort((a, b) => abs(b.size) - abs(a.size));
    found.length = mmin(found.length, maxJumps - K);
    const J = [...p.subarray(0, K), ...found.map((f) => f.size)];
    const S = [...p.subarray(K, 2 * K), ...found.map(() => 0)];
    const th = [...p.subarray(2 * K), ...found.map((f) => f.at)];
    let q = pack(J, S, th);
    fitJumps(dr, di, N, nLo, q);
    const before = q.length;
    q = tidy(q, N);
    if (q.length === 0) break;
    if (q.length < before) fitJumps(dr, di, N, nLo, q);
    for (let a = 0; a < q.length; a++) if (!isFinite_(q[a])) return null;
    const u = unexplainedBy(q);
    // More jumps must earn their place: fitting noise or a smooth part barely lowers the residual.
    if (round > 0 && !(u < 0.5 * unexplained)) {
      residual(dr, di, N, p, er, ei);
      break;
    }
    p = q;
    unexplained = u;
  }
  if (p.length === 0 || !(unexplained <= MAX_UNEXPLAINED)) return null;
  p = tidy(p, N); // sorted by phase
  const k3 = p.length / 3;
  return { size: p.slice(0, k3), bend: p.slice(k3, 2 * k3), at: p.slice(2 * k3), unexplained };
}

/* ------------------------------------------------------------------------------------------------------ */
/* Public API                                                                                                */

function toTimes(s: Spectrum, r: Scan): Extremes {
  const T = s.f0 > 0 ? 1 / s.f0 : 0;
  const tOf = (th: number): number => {
    const t = (th / TWO_PI) * T;
    return t >= T ? 0 : t + 0;
  };
  return { max: r.max, tMax: tOf(r.thMax), min: r.min, tMin: tOf(r.thMin) };
}

/** Extremes of the jump model's estimate, or null when the model is not trusted. */
function jumpScan(s: Spectrum, raw: Scan): Scan | null {
  const jumps = findJumps(s);
  if (!jumps) return null;
  const N = order(s);
  const re = Float64Array.from(s.re);
  const im = Float64Array.from(s.im);
  im[0] = 0;
  let absTotal = 0;
  for (let k = 0; k < jumps.at.length; k++) {
    const J = jumps.size[k];
    const S = jumps.bend[k];
    const th = jumps.at[k];
    absTotal += abs(J);
    // Subtract (1/π)·e^{−jnθ}·(J/(jn) + S/(jn)²), the spectra of J·saw and S·kink placed at θ.
    const c = cos(th);
    const sn = sin(th);
    let zr = 1;
    let zi = 0;
    for (let n = 1; n <= N; n++) {
      if ((n - 1) % RESEED === 0) {
        zr = cos(n * th);
        zi = sin(n * th);
      } else {
        const t = zr * c - zi * sn;
        zi = zr * sn + zi * c;
        zr = t;
      }
      const a = J / (PI * n);
      const b = S / (PI * n * n);
      re[n] += a * zi + b * zr;
      im[n] += a * zr - b * zi;
    }
  }
  const est = scanModel({ re, im, N, at: jumps.at, size: jumps.size, bend: jumps.bend });
  if (!isFinite_(est.max) || !isFinite_(est.min)) return null;
  // Never move an extreme by more than the ringing the fitted jumps can explain — unless the fit is exact
  // to rounding (a pulse narrower than the partial sum resolves stands higher than its partial sum).
  const bound = GIBBS_OVERSHOOT * absTotal * 1.05 + 1e-9 * (abs(raw.max) + abs(raw.min));
  const moved = mmax(abs(est.max - raw.max), abs(est.min - raw.min));
  if (!(moved <= bound) && !(jumps.unexplained <= EXACT_FIT)) return null;
  return est;
}

/**
 * Largest and smallest value over one period (see the header for the method). Times are in seconds within
 * [0, 1/f0); 0 for a DC-only spectrum.
 */
export function extremes(s: Spectrum, opts: ExtremesOptions = {}): Extremes {
  checkSpectrum(s);
  if (opts === null || typeof opts !== 'object') {
    throw valueError('extremes options must be an object such as { truncated: true }.');
  }
  const truncated = opts.truncated ?? false;
  if (typeof truncated !== 'boolean') throw valueError('truncated must be TRUE or FALSE.');
  const raw = scanModel(noJumps(s.re, s.im, order(s)));
  if (truncated) return toTimes(s, raw);
  let est: Scan | null = null;
  try {
    est = jumpScan(s, raw);
  } catch (e) {
    if (e instanceof HcError) throw e;
    est = null; // a numerical failure of the model falls back to the partial sum
  }
  return toTimes(s, est ?? raw);
}

/** Largest value over a period (HC.PEAK). */
export const peak = (s: Spectrum, opts?: ExtremesOptions): number => extremes(s, opts).max;
/** Smallest value over a period (HC.VALLEY). */
export const valley = (s: Spectrum, opts?: ExtremesOptions): number => extremes(s, opts).min;
/** PEAK − VALLEY (HC.PKPK). */
export function pp(s: Spectrum, opts?: ExtremesOptions): number {
  const e = extremes(s, opts);
  return e.max - e.min;
}
