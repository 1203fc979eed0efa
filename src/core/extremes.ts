/**
 * Largest and smallest value over one period of a waveform given by its spectrum (HC.PEAK, HC.VALLEY,
 * HC.PP, and the peaks used by HC.CREST and HC.STRESS).
 *
 * Continuous waveforms (coefficients decaying faster than 1/n): the partial sum is sampled by one inverse
 * FFT on a power-of-two grid of at least 8·N points per period. Every grid-local extreme that could still be
 * the global one (within a bound on the curvature between grid points, ½·Σ n²|C_n|·(π/P)²) is refined by
 * Newton's method on x′(t) = 0, safeguarded by bisection inside a sign-changing bracket; x, x′ and x″ come
 * from one rotation recurrence for e^{jnθ} (re-seeded every 64 harmonics). The result is the partial sum's
 * own extreme to about 1e-13 relative (the rounding of the sums), at any N.
 *
 * Waveforms with jumps (coefficients decaying like 1/n): a truncated series overshoots each jump by
 * (Si(π)/π − ½)·jump ≈ 8.95 % of it (Gibbs) at every N, so its extremes are not the waveform's. By default
 * the jumps are modelled: a jump J at phase θ makes d_n = jπn·C_n tend to J·e^{−jnθ}. The jump regime is
 * recognised from the tail (the mean |d_n|² over the top half of the harmonics at least half that of the
 * quarter below it, so 1/n² spectra such as a triangle or a rectified sine never qualify), jumps are located
 * as the peaks of a Hann concentration kernel Σ w_n·Re(d_n e^{jnθ}), and sizes and phases are refined
 * together by damped Gauss–Newton (Levenberg–Marquardt) least squares on the upper three quarters of the
 * harmonics. The exact spectra of the fitted unit sawtooths (jump +1 at θ: C_n = −j·e^{−jnθ}/(πn)) are
 * subtracted; the remainder is continuous, so its partial sum converges without ringing. The estimate is
 * that remainder plus the closed-form sawtooths, and its extremes include the one-sided limits at the jumps
 * (the time returned is then the jump's). Square, pulse and sawtooth spectra come out within ~1e-10 of the
 * true levels for N ≥ 49; a pulse with smooth ripple within ~1e-3 of its amplitude (the ripple's own
 * truncation). The model is rejected, and the plain partial sum's extremes returned, when the fit leaves more
 * than 5 % of the tail energy unexplained or would move an extreme by more than the Gibbs overshoot of the
 * fitted jumps. `truncated: true` always returns the plain partial sum's extremes (ringing included).
 */
import { HcError, numError, valueError } from './errors';
import { evaluateOnGrid } from './fft';
import { order, Spectrum } from './spectrum';

export interface Extremes {
  /** Largest value over one period, and the first time in [0, 1/f0) where it occurs (s). */
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

const TWO_PI = 2 * Math.PI;
/** Gibbs overshoot per unit jump: Si(π)/π − ½. */
export const GIBBS_OVERSHOOT = 0.0894898722360836;

/* ------------------------------------------------------------------------------------------------------ */
/* Spectrum checks shared with measures.ts                                                                   */

/** Reject anything that is not a well-formed Spectrum; `what` names the argument. */
export function checkSpectrum(s: Spectrum, what = 'spectrum'): Spectrum {
  if (!s || typeof s !== 'object' || !(s.re instanceof Float64Array) || !(s.im instanceof Float64Array)) {
    throw valueError(`${what} must be a spectrum (rows n, frequency, amplitude, phase).`);
  }
  if (s.re.length === 0 || s.re.length !== s.im.length) {
    throw valueError(`${what} must hold at least the DC row, with matching real and imaginary parts.`);
  }
  if (typeof s.f0 !== 'number' || !Number.isFinite(s.f0) || s.f0 < 0) {
    throw numError(`${what}: the fundamental frequency must be a finite number ≥ 0 Hz, got ${s.f0}.`);
  }
  const N = s.re.length - 1;
  if (N > 0 && !(s.f0 > 0)) throw numError(`${what}: a spectrum with harmonics needs a fundamental frequency > 0 Hz.`);
  for (let n = 0; n <= N; n++) {
    if (!Number.isFinite(s.re[n]) || !Number.isFinite(s.im[n])) {
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
  const th = theta - TWO_PI * Math.floor(theta / TWO_PI);
  const c1 = Math.cos(th);
  const s1 = Math.sin(th);
  let x = re[0];
  let d1 = 0;
  let d2 = 0;
  let zr = 1;
  let zi = 0;
  for (let n = 1; n <= N; n++) {
    if ((n - 1) % RESEED === 0) {
      zr = Math.cos(n * th);
      zi = Math.sin(n * th);
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
/* The function whose extremes are searched: a partial sum plus closed-form sawtooths                        */

/**
 * f(θ) = partial sum (re, im) + Σ_k size[k]·saw(θ − at[k]), saw(φ) = ½ − φ/2π on (0, 2π), 0 at the jump.
 * `at` is sorted ascending in [0, 2π). Without jumps f is the partial sum itself.
 */
interface Model {
  re: Float64Array;
  im: Float64Array;
  N: number;
  at: Float64Array;
  size: Float64Array;
  slope: number; // −Σ size / 2π: the derivative of the sawtooth part
}

function sawSum(m: Model, theta: number): number {
  let v = 0;
  for (let k = 0; k < m.at.length; k++) {
    const phi = (theta - m.at[k]) / TWO_PI;
    const f = phi - Math.floor(phi);
    if (f !== 0) v += m.size[k] * (0.5 - f);
  }
  return v;
}

/** f, f′, f″ at θ into out (the jump midpoint at a jump). */
function evalModel(m: Model, theta: number, out: Float64Array): void {
  evalSeries(m.re, m.im, m.N, theta, out);
  if (m.at.length > 0) {
    out[0] += sawSum(m, theta);
    out[1] += m.slope;
  }
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
    let next = h < 0 ? x - g / h : NaN;
    if (!(next > lo && next < hi)) next = 0.5 * (lo + hi);
    const step = Math.abs(next - x);
    if (step <= 1e-14 * (1 + Math.abs(x)) || hi - lo <= 1e-14 * (1 + Math.abs(x))) {
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
function searchInterval(m: Model, sigma: number, a: number, b: number, buf: Float64Array, best: Found): void {
  const S = 16;
  let prevT = a;
  evalModel(m, a, buf);
  let prevG = sigma * buf[1];
  for (let i = 1; i <= S; i++) {
    const t = a + ((b - a) * i) / S;
    evalModel(m, t, buf);
    if (sigma * buf[0] > sigma * best.value) {
      best.value = buf[0];
      best.theta = t;
    }
    const gt = sigma * buf[1];
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
  const c1 = sigma * L * ga;
  const c2 = sigma * (3 * (fb - fa) - L * (2 * ga + gb));
  const c3 = sigma * (2 * (fa - fb) + L * (ga + gb));
  // σH′(s) = c1 + 2c2 s + 3c3 s²; a local max is a root where it falls through zero.
  let best = -Infinity;
  const tryRoot = (s: number): void => {
    if (!(s > 0 && s < 1)) return;
    if (2 * c2 + 6 * c3 * s >= 0) return; // not a maximum
    const v = sigma * fa + s * (c1 + s * (c2 + s * c3));
    if (v > best) {
      best = v;
      at[0] = s;
    }
  };
  const A = 3 * c3;
  const B = 2 * c2;
  const C = c1;
  if (Math.abs(A) <= 1e-14 * (Math.abs(B) + Math.abs(C))) {
    if (B !== 0) tryRoot(-C / B);
  } else {
    const disc = B * B - 4 * A * C;
    if (disc >= 0) {
      const q = -0.5 * (B + (B >= 0 ? 1 : -1) * Math.sqrt(disc));
      if (q !== 0) tryRoot(C / q);
      tryRoot(q / A);
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
  let m0 = Math.abs(re[0]);
  for (let n = 1; n <= N; n++) {
    const a = Math.hypot(re[n], im[n]);
    m4 += n * n * n * n * a;
    m0 += a;
  }
  for (let k = 0; k < K; k++) m0 += Math.abs(m.size[k]);
  if (m4 === 0 && K === 0) return { max: re[0], thMax: 0, min: re[0], thMin: 0 };

  const P = gridSize(N);
  const h = TWO_PI / P;
  const val = evaluateOnGrid({ f0: 1, re, im }, P, new Float64Array(P));
  const dre = new Float64Array(N + 1);
  const dim = new Float64Array(N + 1);
  for (let n = 1; n <= N; n++) {
    dre[n] = -n * im[n];
    dim[n] = n * re[n];
  }
  const der = evaluateOnGrid({ f0: 1, re: dre, im: dim }, P, new Float64Array(P));

  // Sample sequence: positions, values, slopes; link[i] = 1 when (i, i+1) is an interval of one piece.
  const L = K === 0 ? P + 1 : P + 2 * K;
  const pos = new Float64Array(L);
  const fv = new Float64Array(L);
  const fd = new Float64Array(L);
  const link = new Uint8Array(L);
  let count = 0;
  if (K === 0) {
    for (let i = 0; i <= P; i++) {
      pos[i] = i * h;
      fv[i] = val[i % P];
      fd[i] = der[i % P];
      link[i] = i < P ? 1 : 0;
    }
    count = P + 1;
  } else {
    addSawtooths(m, val, P);
    const buf = new Float64Array(3);
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
      pos[count] = a0;
      fv[count] = limMid[k] + 0.5 * m.size[k];
      fd[count] = limDer[k];
      link[count++] = 1;
      for (let i = Math.floor(a0 / h) + 1; i * h < a1; i++) {
        pos[count] = i * h;
        fv[count] = val[i % P];
        fd[count] = der[i % P] + m.slope;
        link[count++] = 1;
      }
      pos[count] = a1;
      fv[count] = limMid[k1] - 0.5 * m.size[k1];
      fd[count] = limDer[k1];
      link[count++] = 0;
    }
  }

  const res: Scan = { max: -Infinity, thMax: 0, min: Infinity, thMin: 0 };
  for (let i = 0; i < count; i++) {
    if (fv[i] > res.max) { res.max = fv[i]; res.thMax = pos[i]; }
    if (fv[i] < res.min) { res.min = fv[i]; res.thMin = pos[i]; }
  }

  let hMax = h;
  for (let i = 0; i + 1 < count; i++) if (link[i]) hMax = Math.max(hMax, pos[i + 1] - pos[i]);
  const bound = (m4 * hMax ** 4) / 384 + 1e-13 * m0;
  const buf = new Float64Array(3);
  const best: Found = { value: 0, theta: 0 };
  const sArg = new Float64Array(1);
  const cand: number[] = [];
  const est = new Float64Array(count);
  const arg = new Float64Array(count);

  for (const sigma of [1, -1]) {
    let top = sigma > 0 ? res.max : -res.min;
    cand.length = 0;
    for (let i = 0; i + 1 < count; i++) {
      if (!link[i]) continue;
      const len = pos[i + 1] - pos[i];
      const e = hermiteMax(sigma, fv[i], fd[i], fv[i + 1], fd[i + 1], len, sArg);
      if (e + bound > top) {
        est[i] = e;
        arg[i] = pos[i] + sArg[0] * len;
        cand.push(i);
      }
    }
    cand.sort((p, q) => est[q] - est[p]);
    for (const i of cand) {
      if (est[i] + bound <= top) break;
      best.value = sigma * top;
      best.theta = sigma > 0 ? res.thMax : res.thMin;
      const ga = sigma * fd[i];
      const gb = sigma * fd[i + 1];
      if (ga > 0 && gb < 0) newtonMax(m, sigma, pos[i], pos[i + 1], arg[i], buf, best);
      else searchInterval(m, sigma, pos[i], pos[i + 1], buf, best);
      if (sigma * best.value > top) {
        top = sigma * best.value;
        if (sigma > 0) { res.max = best.value; res.thMax = best.theta; }
        else { res.min = best.value; res.thMin = best.theta; }
      }
    }
  }
  res.thMax -= TWO_PI * Math.floor(res.thMax / TWO_PI);
  res.thMin -= TWO_PI * Math.floor(res.thMin / TWO_PI);
  return res;
}

/**
 * Add the sawtooth part to the grid values (one sweep over the sorted jumps). With u = θ/2π:
 * Σ J_k(½ − frac(u − u_k)) = S(½ − u) + Σ J_k u_k − Σ_{u_k > u} J_k, and the jump midpoint where u = u_k.
 */
function addSawtooths(m: Model, grid: Float64Array, P: number): void {
  const K = m.at.length;
  let S = 0;
  let SU = 0;
  let suffix = 0; // Σ J_k over u_k > u
  const u = new Float64Array(K);
  for (let k = 0; k < K; k++) {
    u[k] = m.at[k] / TWO_PI;
    S += m.size[k];
    SU += m.size[k] * u[k];
    suffix += m.size[k];
  }
  let k = 0;
  for (let i = 0; i < P; i++) {
    const ui = i / P;
    let eq = 0;
    while (k < K && u[k] <= ui) {
      suffix -= m.size[k];
      if (u[k] === ui) eq += m.size[k];
      k++;
    }
    grid[i] += S * (0.5 - ui) + SU - suffix - 0.5 * eq;
  }
}

/* ------------------------------------------------------------------------------------------------------ */
/* Jump estimation                                                                                           */

/** Below this order the tail is too short to tell jumps from smooth features. */
const MIN_JUMP_ORDER = 16;
/** Tail energy ratio (top half / quarter below) above which the spectrum is treated as having jumps. */
const JUMP_TAIL_RATIO = 0.5;
/** A fitted model must explain all but this fraction of the tail energy. */
const MAX_UNEXPLAINED = 0.05;
const MAX_JUMPS = 32;
const MAX_FIT_BAND = 2048;

export interface Jumps {
  /** Jump phases θ = ωt in [0, 2π), ascending. */
  at: Float64Array;
  /** Jump sizes (value just after minus value just before). */
  size: Float64Array;
  /** Fraction of the fitted tail energy the jumps leave unexplained. */
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
  const q = Math.floor(N / 4);
  const hlf = Math.floor(N / 2);
  const eU = bandEnergy(dr, di, hlf, N);
  const eM = bandEnergy(dr, di, q, hlf);
  if (!(eU > 0) || eU < JUMP_TAIL_RATIO * eM) return false;
  if (Math.sqrt(eU) < minLevel) return false;
  // Jumps fill the tail broadly; a few isolated high tones do not.
  let big = 0;
  for (let n = hlf + 1; n <= N; n++) big = Math.max(big, dr[n] * dr[n] + di[n] * di[n]);
  let count = 0;
  for (let n = hlf + 1; n <= N; n++) if (dr[n] * dr[n] + di[n] * di[n] >= 1e-6 * big) count++;
  return count >= Math.max(3, 0.04 * (N - hlf));
}

/**
 * Jump function estimate G(θ) = Σ w_n Re(e_n e^{jnθ}) / Σ w_n with a Hann window over n = 1..N, on the
 * grid: ≈ J near a jump J, small elsewhere (the window keeps the side lobes below 3 %).
 */
function concentration(er: Float64Array, ei: Float64Array, N: number, P: number, out: Float64Array): Float64Array {
  const re = new Float64Array(N + 1);
  const im = new Float64Array(N + 1);
  let sw = 0;
  for (let n = 1; n <= N; n++) {
    const s = Math.sin((Math.PI * n) / (N + 1));
    const w = s * s;
    sw += w;
    re[n] = w * er[n];
    im[n] = w * ei[n];
  }
  const g = evaluateOnGrid({ f0: 1, re, im }, P, out);
  const inv = 1 / sw;
  for (let i = 0; i < P; i++) g[i] *= inv;
  return g;
}

/**
 * Least-squares fit of d_n ≈ Σ_k J_k e^{−jnθ_k} over n in [nLo, N] with weights (n/N)², all J and θ
 * together (Levenberg–Marquardt). Updates J and th in place; returns the weighted residual energy.
 */
function fitJumps(dr: Float64Array, di: Float64Array, N: number, nLo: number, J: Float64Array, th: Float64Array): number {
  const K = J.length;
  const D = 2 * K;
  const A = new Float64Array(D * D);
  const g = new Float64Array(D);
  const M = new Float64Array(D * D);
  const delta = new Float64Array(D);
  const er = new Float64Array(K);
  const ei = new Float64Array(K);
  const cr = new Float64Array(K);
  const ci = new Float64Array(K);
  const pr = new Float64Array(D); // partial derivatives of the residual, real and imaginary
  const pi = new Float64Array(D);
  const J2 = new Float64Array(K);
  const th2 = new Float64Array(K);
  const invN2 = 1 / (N * N);

  const seed = (n: number, tt: Float64Array): void => {
    for (let k = 0; k < K; k++) {
      er[k] = Math.cos(n * tt[k]);
      ei[k] = -Math.sin(n * tt[k]);
    }
  };
  const step = (tt: Float64Array): void => {
    for (let k = 0; k < K; k++) {
      cr[k] = Math.cos(tt[k]);
      ci[k] = -Math.sin(tt[k]);
    }
  };
  const advance = (): void => {
    for (let k = 0; k < K; k++) {
      const t = er[k] * cr[k] - ei[k] * ci[k];
      ei[k] = er[k] * ci[k] + ei[k] * cr[k];
      er[k] = t;
    }
  };
  const cost = (JJ: Float64Array, tt: Float64Array): number => {
    step(tt);
    let F = 0;
    for (let n = nLo; n <= N; n++) {
      if ((n - nLo) % RESEED === 0) seed(n, tt);
      else advance();
      let rr = dr[n];
      let ri = di[n];
      for (let k = 0; k < K; k++) {
        rr -= JJ[k] * er[k];
        ri -= JJ[k] * ei[k];
      }
      F += n * n * invN2 * (rr * rr + ri * ri);
    }
    return F;
  };

  let F = cost(J, th);
  let lambda = 1e-3;
  for (let iter = 0; iter < 60; iter++) {
    A.fill(0);
    g.fill(0);
    step(th);
    for (let n = nLo; n <= N; n++) {
      if ((n - nLo) % RESEED === 0) seed(n, th);
      else advance();
      const w = n * n * invN2;
      let rr = dr[n];
      let ri = di[n];
      for (let k = 0; k < K; k++) {
        rr -= J[k] * er[k];
        ri -= J[k] * ei[k];
        // ∂r/∂J_k = −E_k; ∂r/∂θ_k = jn·J_k·E_k
        pr[k] = -er[k];
        pi[k] = -ei[k];
        pr[K + k] = -n * J[k] * ei[k];
        pi[K + k] = n * J[k] * er[k];
      }
      for (let a = 0; a < D; a++) {
        const xa = w * pr[a];
        const ya = w * pi[a];
        g[a] -= xa * rr + ya * ri;
        for (let b = a; b < D; b++) A[a * D + b] += xa * pr[b] + ya * pi[b];
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
      for (let k = 0; k < K; k++) {
        J2[k] = J[k] + delta[k];
        th2[k] = th[k] + delta[K + k];
      }
      const F2 = cost(J2, th2);
      if (F2 < F) {
        improved = true;
        const rel = (F - F2) / (F || 1);
        J.set(J2);
        th.set(th2);
        F = F2;
        lambda = Math.max(lambda / 10, 1e-12);
        let maxStep = 0;
        for (let k = 0; k < K; k++) maxStep = Math.max(maxStep, Math.abs(delta[K + k]));
        if (maxStep * N < 1e-13 || rel < 1e-15) return F;
      } else lambda *= 10;
    }
    if (!improved) break;
  }
  return F;
}

/** Solve M·x = b (M symmetric positive definite, overwritten by its Cholesky factor). */
function choleskySolve(M: Float64Array, b: Float64Array, x: Float64Array, D: number): boolean {
  for (let j = 0; j < D; j++) {
    let s = M[j * D + j];
    for (let k = 0; k < j; k++) s -= M[j * D + k] * M[j * D + k];
    if (!(s > 0)) return false;
    const l = Math.sqrt(s);
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
  for (let i = 0; i < D; i++) if (!Number.isFinite(x[i])) return false;
  return true;
}

/** e_n = d_n − Σ J_k e^{−jnθ_k} for n = 1..N. */
function residual(dr: Float64Array, di: Float64Array, N: number, J: Float64Array, th: Float64Array, outR: Float64Array, outI: Float64Array): void {
  outR.set(dr);
  outI.set(di);
  for (let k = 0; k < J.length; k++) {
    const c = Math.cos(th[k]);
    const s = -Math.sin(th[k]);
    let zr = 1;
    let zi = 0;
    for (let n = 1; n <= N; n++) {
      if ((n - 1) % RESEED === 0) {
        zr = Math.cos(n * th[k]);
        zi = -Math.sin(n * th[k]);
      } else {
        const t = zr * c - zi * s;
        zi = zr * s + zi * c;
        zr = t;
      }
      outR[n] -= J[k] * zr;
      outI[n] -= J[k] * zi;
    }
  }
}

/**
 * Estimate the jumps of the waveform behind a spectrum, or null when the spectrum does not look like one
 * with jumps or no jump model explains its tail. Exported for diagnostics and tests.
 */
export function findJumps(s: Spectrum): Jumps | null {
  const N = order(s);
  if (N < MIN_JUMP_ORDER) return null;
  const dr = new Float64Array(N + 1);
  const di = new Float64Array(N + 1);
  let ac = 0;
  for (let n = 1; n <= N; n++) {
    dr[n] = -Math.PI * n * s.im[n];
    di[n] = Math.PI * n * s.re[n];
    ac += s.re[n] * s.re[n] + s.im[n] * s.im[n];
  }
  const scale = Math.sqrt(ac / 2);
  if (!looksLikeJumps(dr, di, N, 1e-8 * scale)) return null;

  const nLo = Math.max(1, Math.floor(N / 4), N - MAX_FIT_BAND + 1);
  const maxJumps = Math.min(MAX_JUMPS, Math.floor((N - nLo + 1) / 6));
  const P = gridSize(N);
  const G = new Float64Array(P);
  const er = new Float64Array(N + 1);
  const ei = new Float64Array(N + 1);
  er.set(dr);
  ei.set(di);
  let J: Float64Array = new Float64Array(0);
  let th: Float64Array = new Float64Array(0);
  const sep = (2 * TWO_PI) / N; // Hann main-lobe half width: closer peaks are one feature

  for (let round = 0; round < 4 && J.length < maxJumps; round++) {
    // Chase further jumps only while the residual still looks like jumps of some size.
    if (round > 0 && !looksLikeJumps(er, ei, N, 1e-4 * maxAbs(J))) break;
    concentration(er, ei, N, P, G);
    let gBig = 0;
    for (let i = 0; i < P; i++) gBig = Math.max(gBig, Math.abs(G[i]));
    if (!(gBig > 0)) break;
    const newAt: number[] = [];
    const newJ: number[] = [];
    for (let i = 0; i < P; i++) {
      const v = Math.abs(G[i]);
      if (v < 0.2 * gBig) continue;
      const vp = Math.abs(G[(i + P - 1) % P]);
      const vn = Math.abs(G[(i + 1) % P]);
      if (!(v >= vp && v > vn)) continue;
      // Parabolic interpolation of the peak position.
      const den = vp - 2 * v + vn;
      const off = den < 0 ? (0.5 * (vp - vn)) / den : 0;
      const t = ((i + off) * TWO_PI) / P;
      let near = false;
      for (let k = 0; k < th.length; k++) if (circDist(t, th[k]) < sep) near = true;
      if (near) continue;
      newAt.push(t);
      newJ.push(G[i]);
    }
    if (newAt.length === 0) break;
    // Strongest first, up to the cap.
    const order_ = newAt.map((_, k) => k).sort((a, b) => Math.abs(newJ[b]) - Math.abs(newJ[a]));
    const take = Math.min(order_.length, maxJumps - J.length);
    const J2 = new Float64Array(J.length + take);
    const th2 = new Float64Array(J.length + take);
    J2.set(J);
    th2.set(th);
    for (let k = 0; k < take; k++) {
      J2[J.length + k] = newJ[order_[k]];
      th2[J.length + k] = newAt[order_[k]];
    }
    J = J2;
    th = th2;
    fitJumps(dr, di, N, nLo, J, th);
    [J, th] = tidy(J, th, N);
    if (J.length === 0) return null;
    residual(dr, di, N, J, th, er, ei);
  }
  if (J.length === 0) return null;

  // Unexplained fraction of the tail energy (unweighted, over the fitted band).
  let eRes = 0;
  let eAll = 0;
  for (let n = nLo; n <= N; n++) {
    eRes += er[n] * er[n] + ei[n] * ei[n];
    eAll += dr[n] * dr[n] + di[n] * di[n];
  }
  const unexplained = eAll > 0 ? eRes / eAll : 1;
  if (!(unexplained <= MAX_UNEXPLAINED)) return null;
  for (let k = 0; k < J.length; k++) if (!Number.isFinite(J[k]) || !Number.isFinite(th[k])) return null;
  // Sort by phase.
  const idx = Array.from(th, (_, k) => k).sort((a, b) => th[a] - th[b]);
  return {
    at: Float64Array.from(idx, (k) => th[k]),
    size: Float64Array.from(idx, (k) => J[k]),
    unexplained,
  };
}

const maxAbs = (a: Float64Array): number => {
  let m = 0;
  for (let k = 0; k < a.length; k++) m = Math.max(m, Math.abs(a[k]));
  return m;
};

function circDist(a: number, b: number): number {
  const d = Math.abs(a - b) % TWO_PI;
  return Math.min(d, TWO_PI - d);
}

/** Wrap phases into [0, 2π), merge jumps that converged onto one place, drop negligible ones. */
function tidy(J: Float64Array, th: Float64Array, N: number): [Float64Array, Float64Array] {
  const big = maxAbs(J);
  const at: number[] = [];
  const sz: number[] = [];
  const idx = Array.from(th, (_, k) => k);
  for (const k of idx) th[k] -= TWO_PI * Math.floor(th[k] / TWO_PI);
  idx.sort((a, b) => th[a] - th[b]);
  for (const k of idx) {
    if (!(Math.abs(J[k]) > 1e-12 * big)) continue;
    const last = at.length - 1;
    if (last >= 0 && circDist(at[last], th[k]) < 1e-3 / N) {
      sz[last] += J[k];
      continue;
    }
    at.push(th[k]);
    sz.push(J[k]);
  }
  if (at.length > 1 && circDist(at[0], at[at.length - 1]) < 1e-3 / N) {
    sz[0] += sz.pop() as number;
    at.pop();
  }
  return [Float64Array.from(sz), Float64Array.from(at)];
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

/** Extremes of the partial sum itself (Gibbs ringing included). */
function truncatedScan(s: Spectrum): Scan {
  return scanModel({ re: s.re, im: s.im, N: order(s), at: new Float64Array(0), size: new Float64Array(0), slope: 0 });
}

/** Extremes of the jump model's estimate, or null when the model is not trusted. */
function jumpScan(s: Spectrum, raw: Scan): Scan | null {
  const jumps = findJumps(s);
  if (!jumps) return null;
  const N = order(s);
  const re = Float64Array.from(s.re);
  const im = Float64Array.from(s.im);
  im[0] = 0;
  let total = 0;
  let absTotal = 0;
  for (let k = 0; k < jumps.at.length; k++) {
    const J = jumps.size[k];
    const th = jumps.at[k];
    total += J;
    absTotal += Math.abs(J);
    // Subtract J·(−j/(πn))·e^{−jnθ} = (J/(πn))·(−sin nθ − j cos nθ).
    const c = Math.cos(th);
    const sn = Math.sin(th);
    let zr = 1;
    let zi = 0;
    for (let n = 1; n <= N; n++) {
      if ((n - 1) % RESEED === 0) {
        zr = Math.cos(n * th);
        zi = Math.sin(n * th);
      } else {
        const t = zr * c - zi * sn;
        zi = zr * sn + zi * c;
        zr = t;
      }
      const a = J / (Math.PI * n);
      re[n] += a * zi;
      im[n] += a * zr;
    }
  }
  const est = scanModel({ re, im, N, at: jumps.at, size: jumps.size, slope: -total / TWO_PI });
  // Never move an extreme by more than the ringing the fitted jumps can explain.
  const bound = GIBBS_OVERSHOOT * absTotal * 1.05 + 1e-9 * (Math.abs(raw.max) + Math.abs(raw.min));
  if (!(Math.abs(est.max - raw.max) <= bound && Math.abs(est.min - raw.min) <= bound)) return null;
  if (!Number.isFinite(est.max) || !Number.isFinite(est.min)) return null;
  return est;
}

/**
 * Largest and smallest value over one period (see the header for the method). Times are in seconds within
 * [0, 1/f0); 0 for a DC-only spectrum.
 */
export function extremes(s: Spectrum, opts: ExtremesOptions = {}): Extremes {
  checkSpectrum(s);
  if (opts === null || typeof opts !== 'object') throw valueError('extremes options must be an object such as { truncated: true }.');
  const truncated = opts.truncated ?? false;
  if (typeof truncated !== 'boolean') throw valueError('truncated must be TRUE or FALSE.');
  const raw = truncatedScan(s);
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
/** PEAK − VALLEY (HC.PP). */
export function pp(s: Spectrum, opts?: ExtremesOptions): number {
  const e = extremes(s, opts);
  return e.max - e.min;
}
