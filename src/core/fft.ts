import { finite, numError, valueError } from './errors';
import { checkHarmonics, makeSpectrum, order, Spectrum } from './spectrum';

/*
 * Complex FFT of any length, in place and unnormalised:
 *   forward  X[n] = Σ x_k e^{−j2πnk/M},   inverse  x_k = Σ X[n] e^{+j2πnk/M}.
 * Lengths whose prime factors are all ≤ MAX_RADIX use a Stockham autosort transform (radix 8, 4, 2, 3, 5 and
 * a generic small-prime stage; no bit reversal, unit-stride inner loops). Other lengths use Bluestein's
 * chirp-z method on a power-of-two convolution. Plans (twiddles, chirps, scratch) are cached per length.
 */

const MAX_RADIX = 31;
const MAX_PLANS = 48; // bound the cache: a sheet may sample many different lengths

interface Stage {
  p: number; // radix
  m: number; // sub-transform length after this stage (n_stage / p)
  s: number; // stride
  wr: Float64Array; // twiddles w^{r·j}, w = e^{−j2π/(p·m)}, at [j·(p−1) + r − 1]
  wi: Float64Array;
}

interface StockhamPlan {
  kind: 'stockham';
  n: number;
  stages: Stage[];
  yr: Float64Array; // ping-pong buffer
  yi: Float64Array;
  tr: Float64Array; // generic-radix scratch
  ti: Float64Array;
}

interface BluesteinPlan {
  kind: 'bluestein';
  n: number;
  m: number;
  inner: StockhamPlan;
  cr: Float64Array; // chirp e^{−jπk²/n}
  ci: Float64Array;
  br: Float64Array; // FFT of the conjugate chirp filter, scaled by 1/m
  bi: Float64Array;
  ar: Float64Array; // scratch
  ai: Float64Array;
}

type Plan = StockhamPlan | BluesteinPlan;

const plans = new Map<number, Plan>();

function remember<T>(cache: Map<number, T>, key: number, value: T): T {
  if (cache.size >= MAX_PLANS) cache.delete(cache.keys().next().value as number);
  cache.set(key, value);
  return value;
}

/** Radices for n (4s first, then 2, 3, 5, other primes), or null if a prime factor exceeds MAX_RADIX. */
function factor(n: number): number[] | null {
  const f: number[] = [];
  let r = n;
  // Radix 8 for the first two stages, where its inputs and outputs are near each other; later stages read and
  // write 16 streams a power of two apart, which thrash the cache at radix 8 (measured: 2^15 points 20 % faster
  // as 8·8·4·4·4·4 than as 8^5 or 4^7·2).
  for (let k = 0; k < 2 && r % 8 === 0 && r > 8; k++) {
    f.push(8);
    r /= 8;
  }
  while (r % 4 === 0) {
    f.push(4);
    r /= 4;
  }
  if (r % 2 === 0) {
    f.push(2);
    r /= 2;
  }
  for (let p = 3; p <= MAX_RADIX && r > 1; p += 2) {
    while (r % p === 0) {
      f.push(p);
      r /= p;
    }
  }
  return r === 1 ? f : null;
}

function stockhamPlan(n: number, radices: number[]): StockhamPlan {
  const stages: Stage[] = [];
  let len = n;
  let s = 1;
  let maxP = 2;
  for (const p of radices) {
    const m = len / p;
    const wr = new Float64Array(m * (p - 1));
    const wi = new Float64Array(m * (p - 1));
    for (let j = 0; j < m; j++) {
      for (let r = 1; r < p; r++) {
        // angle reduced to an exact integer numerator before scaling
        const ang = (-2 * Math.PI * ((r * j) % len)) / len;
        wr[j * (p - 1) + r - 1] = Math.cos(ang);
        wi[j * (p - 1) + r - 1] = Math.sin(ang);
      }
    }
    stages.push({ p, m, s, wr, wi });
    maxP = Math.max(maxP, p);
    len = m;
    s *= p;
  }
  return {
    kind: 'stockham', n, stages,
    yr: new Float64Array(n), yi: new Float64Array(n),
    tr: new Float64Array(2 * maxP), ti: new Float64Array(2 * maxP),
  };
}

const C3 = Math.sqrt(3) / 2;
const R2 = Math.SQRT1_2;
const C51 = Math.cos((2 * Math.PI) / 5);
const C52 = Math.cos((4 * Math.PI) / 5);
const S51 = Math.sin((2 * Math.PI) / 5);
const S52 = Math.sin((4 * Math.PI) / 5);

/** One decimation-in-frequency Stockham stage: x → y (one function per radix keeps each loop small for the JIT). */
function stage(st: Stage, xr: Float64Array, xi: Float64Array, yr: Float64Array, yi: Float64Array, tr: Float64Array, ti: Float64Array): void {
  switch (st.p) {
    case 8:
      return stage8(st, xr, xi, yr, yi);
    case 4:
      return stage4(st, xr, xi, yr, yi);
    case 2:
      return stage2(st, xr, xi, yr, yi);
    case 3:
      return stage3(st, xr, xi, yr, yi);
    case 5:
      return stage5(st, xr, xi, yr, yi);
    default:
      return stageOdd(st, xr, xi, yr, yi, tr, ti);
  }
}

function stage8(st: Stage, xr: Float64Array, xi: Float64Array, yr: Float64Array, yi: Float64Array): void {
  const { m, s, wr, wi } = st;
  const sm = s * m;
  // Two 4-point DFTs (even and odd inputs) joined by e^{−j2πr/8}, then the twiddles w^{r·j}.
  for (let j = 0; j < m; j++) {
    const w = 7 * j;
    const w1r = wr[w], w1i = wi[w], w2r = wr[w + 1], w2i = wi[w + 1], w3r = wr[w + 2], w3i = wi[w + 2];
    const w4r = wr[w + 3], w4i = wi[w + 3], w5r = wr[w + 4], w5i = wi[w + 4], w6r = wr[w + 5], w6i = wi[w + 5];
    const w7r = wr[w + 6], w7i = wi[w + 6];
    const ib = s * j;
    const ob = 8 * s * j;
    for (let q = 0; q < s; q++) {
      const i0 = ib + q, i1 = i0 + sm, i2 = i1 + sm, i3 = i2 + sm, i4 = i3 + sm, i5 = i4 + sm, i6 = i5 + sm, i7 = i6 + sm;
      // even part: DFT4(x0, x2, x4, x6)
      let ar = xr[i0] + xr[i4], ai = xi[i0] + xi[i4];
      let br = xr[i0] - xr[i4], bi = xi[i0] - xi[i4];
      let cr = xr[i2] + xr[i6], ci = xi[i2] + xi[i6];
      let dr = xr[i2] - xr[i6], di = xi[i2] - xi[i6];
      const e0r = ar + cr, e0i = ai + ci;
      const e2r = ar - cr, e2i = ai - ci;
      const e1r = br + di, e1i = bi - dr; // b − j·d
      const e3r = br - di, e3i = bi + dr; // b + j·d
      // odd part: DFT4(x1, x3, x5, x7)
      ar = xr[i1] + xr[i5]; ai = xi[i1] + xi[i5];
      br = xr[i1] - xr[i5]; bi = xi[i1] - xi[i5];
      cr = xr[i3] + xr[i7]; ci = xi[i3] + xi[i7];
      dr = xr[i3] - xr[i7]; di = xi[i3] - xi[i7];
      const o0r = ar + cr, o0i = ai + ci;
      const o2r = ar - cr, o2i = ai - ci;
      const o1r = br + di, o1i = bi - dr;
      const o3r = br - di, o3i = bi + dr;
      // odd parts times e^{−j2πr/8}: 1, (1 − j)/√2, −j, −(1 + j)/√2
      const p1r = R2 * (o1r + o1i), p1i = R2 * (o1i - o1r);
      const p2r = o2i, p2i = -o2r;
      const p3r = R2 * (o3i - o3r), p3i = -R2 * (o3r + o3i);
      const o = ob + q;
      yr[o] = e0r + o0r;
      yi[o] = e0i + o0i;
      let vr = e1r + p1r, vi = e1i + p1i;
      yr[o + s] = vr * w1r - vi * w1i;
      yi[o + s] = vr * w1i + vi * w1r;
      vr = e2r + p2r; vi = e2i + p2i;
      yr[o + 2 * s] = vr * w2r - vi * w2i;
      yi[o + 2 * s] = vr * w2i + vi * w2r;
      vr = e3r + p3r; vi = e3i + p3i;
      yr[o + 3 * s] = vr * w3r - vi * w3i;
      yi[o + 3 * s] = vr * w3i + vi * w3r;
      vr = e0r - o0r; vi = e0i - o0i;
      yr[o + 4 * s] = vr * w4r - vi * w4i;
      yi[o + 4 * s] = vr * w4i + vi * w4r;
      vr = e1r - p1r; vi = e1i - p1i;
      yr[o + 5 * s] = vr * w5r - vi * w5i;
      yi[o + 5 * s] = vr * w5i + vi * w5r;
      vr = e2r - p2r; vi = e2i - p2i;
      yr[o + 6 * s] = vr * w6r - vi * w6i;
      yi[o + 6 * s] = vr * w6i + vi * w6r;
      vr = e3r - p3r; vi = e3i - p3i;
      yr[o + 7 * s] = vr * w7r - vi * w7i;
      yi[o + 7 * s] = vr * w7i + vi * w7r;
    }
  }
}

function stage4(st: Stage, xr: Float64Array, xi: Float64Array, yr: Float64Array, yi: Float64Array): void {
  const { m, s, wr, wi } = st;
  const sm = s * m;
  for (let j = 0; j < m; j++) {
    const w = 3 * j;
    const w1r = wr[w], w1i = wi[w], w2r = wr[w + 1], w2i = wi[w + 1], w3r = wr[w + 2], w3i = wi[w + 2];
    const ib = s * j;
    const ob = 4 * s * j;
    for (let q = 0; q < s; q++) {
      const i0 = ib + q, i1 = i0 + sm, i2 = i1 + sm, i3 = i2 + sm;
      const t0r = xr[i0] + xr[i2], t0i = xi[i0] + xi[i2];
      const t1r = xr[i0] - xr[i2], t1i = xi[i0] - xi[i2];
      const t2r = xr[i1] + xr[i3], t2i = xi[i1] + xi[i3];
      const t3r = xr[i1] - xr[i3], t3i = xi[i1] - xi[i3];
      const o0 = ob + q, o1 = o0 + s, o2 = o1 + s, o3 = o2 + s;
      yr[o0] = t0r + t2r;
      yi[o0] = t0i + t2i;
      const ar = t1r + t3i, ai = t1i - t3r; // t1 − j·t3
      yr[o1] = ar * w1r - ai * w1i;
      yi[o1] = ar * w1i + ai * w1r;
      const br = t0r - t2r, bi = t0i - t2i;
      yr[o2] = br * w2r - bi * w2i;
      yi[o2] = br * w2i + bi * w2r;
      const cr = t1r - t3i, ci = t1i + t3r; // t1 + j·t3
      yr[o3] = cr * w3r - ci * w3i;
      yi[o3] = cr * w3i + ci * w3r;
    }
  }
}

function stage2(st: Stage, xr: Float64Array, xi: Float64Array, yr: Float64Array, yi: Float64Array): void {
  const { m, s, wr, wi } = st;
  const sm = s * m;
  for (let j = 0; j < m; j++) {
    const w1r = wr[j], w1i = wi[j];
    const ib = s * j;
    const ob = 2 * s * j;
    for (let q = 0; q < s; q++) {
      const i0 = ib + q, i1 = i0 + sm;
      const o0 = ob + q, o1 = o0 + s;
      const ar = xr[i0], ai = xi[i0], br = xr[i1], bi = xi[i1];
      yr[o0] = ar + br;
      yi[o0] = ai + bi;
      const dr = ar - br, di = ai - bi;
      yr[o1] = dr * w1r - di * w1i;
      yi[o1] = dr * w1i + di * w1r;
    }
  }
}

function stage3(st: Stage, xr: Float64Array, xi: Float64Array, yr: Float64Array, yi: Float64Array): void {
  const { m, s, wr, wi } = st;
  const sm = s * m;
  for (let j = 0; j < m; j++) {
    const w = 2 * j;
    const w1r = wr[w], w1i = wi[w], w2r = wr[w + 1], w2i = wi[w + 1];
    const ib = s * j;
    const ob = 3 * s * j;
    for (let q = 0; q < s; q++) {
      const i0 = ib + q, i1 = i0 + sm, i2 = i1 + sm;
      const a0r = xr[i0], a0i = xi[i0];
      const sr = xr[i1] + xr[i2], si = xi[i1] + xi[i2];
      const dr = xr[i1] - xr[i2], di = xi[i1] - xi[i2];
      const hr = a0r - 0.5 * sr, hi = a0i - 0.5 * si;
      const o0 = ob + q, o1 = o0 + s, o2 = o1 + s;
      yr[o0] = a0r + sr;
      yi[o0] = a0i + si;
      const ar = hr + C3 * di, ai = hi - C3 * dr;
      yr[o1] = ar * w1r - ai * w1i;
      yi[o1] = ar * w1i + ai * w1r;
      const br = hr - C3 * di, bi = hi + C3 * dr;
      yr[o2] = br * w2r - bi * w2i;
      yi[o2] = br * w2i + bi * w2r;
    }
  }
}

function stage5(st: Stage, xr: Float64Array, xi: Float64Array, yr: Float64Array, yi: Float64Array): void {
  const { m, s, wr, wi } = st;
  const sm = s * m;
  for (let j = 0; j < m; j++) {
    const w = 4 * j;
    const w1r = wr[w], w1i = wi[w], w2r = wr[w + 1], w2i = wi[w + 1];
    const w3r = wr[w + 2], w3i = wi[w + 2], w4r = wr[w + 3], w4i = wi[w + 3];
    const ib = s * j;
    const ob = 5 * s * j;
    for (let q = 0; q < s; q++) {
      const i0 = ib + q, i1 = i0 + sm, i2 = i1 + sm, i3 = i2 + sm, i4 = i3 + sm;
      const a0r = xr[i0], a0i = xi[i0];
      const s1r = xr[i1] + xr[i4], s1i = xi[i1] + xi[i4];
      const d1r = xr[i1] - xr[i4], d1i = xi[i1] - xi[i4];
      const s2r = xr[i2] + xr[i3], s2i = xi[i2] + xi[i3];
      const d2r = xr[i2] - xr[i3], d2i = xi[i2] - xi[i3];
      const p1r = a0r + C51 * s1r + C52 * s2r, p1i = a0i + C51 * s1i + C52 * s2i;
      const p2r = a0r + C52 * s1r + C51 * s2r, p2i = a0i + C52 * s1i + C51 * s2i;
      const q1r = S51 * d1r + S52 * d2r, q1i = S51 * d1i + S52 * d2i;
      const q2r = S52 * d1r - S51 * d2r, q2i = S52 * d1i - S51 * d2i;
      const o0 = ob + q, o1 = o0 + s, o2 = o1 + s, o3 = o2 + s, o4 = o3 + s;
      yr[o0] = a0r + s1r + s2r;
      yi[o0] = a0i + s1i + s2i;
      let vr = p1r + q1i, vi = p1i - q1r; // p1 − j·q1
      yr[o1] = vr * w1r - vi * w1i;
      yi[o1] = vr * w1i + vi * w1r;
      vr = p2r + q2i; vi = p2i - q2r; // p2 − j·q2
      yr[o2] = vr * w2r - vi * w2i;
      yi[o2] = vr * w2i + vi * w2r;
      vr = p2r - q2i; vi = p2i + q2r; // p2 + j·q2
      yr[o3] = vr * w3r - vi * w3i;
      yi[o3] = vr * w3i + vi * w3r;
      vr = p1r - q1i; vi = p1i + q1r; // p1 + j·q1
      yr[o4] = vr * w4r - vi * w4i;
      yi[o4] = vr * w4i + vi * w4r;
    }
  }
}

function stageOdd(st: Stage, xr: Float64Array, xi: Float64Array, yr: Float64Array, yi: Float64Array, tr: Float64Array, ti: Float64Array): void {
  const { p, m, s, wr, wi } = st;
  const sm = s * m;
  // Generic odd prime p: direct p-point DFT; ω^{rt} is read from the twiddles of the last sub-index.
  // e^{−j2πk/p} = w^{k·m} with w = e^{−j2π/(pm)}; kept in tr/ti[p..2p−1] for k = 0..p−1.
  for (let k = 0; k < p; k++) {
    const ang = (-2 * Math.PI * k) / p;
    tr[p + k] = Math.cos(ang);
    ti[p + k] = Math.sin(ang);
  }
  for (let j = 0; j < m; j++) {
    const ib = s * j;
    const ob = p * s * j;
    for (let q = 0; q < s; q++) {
      for (let t = 0; t < p; t++) {
        tr[t] = xr[ib + q + t * sm];
        ti[t] = xi[ib + q + t * sm];
      }
      for (let r = 0; r < p; r++) {
        let ur = 0;
        let ui = 0;
        for (let t = 0, k = 0; t < p; t++, k += r) {
          if (k >= p) k -= p;
          const cr = tr[p + k], ci = ti[p + k];
          ur += tr[t] * cr - ti[t] * ci;
          ui += tr[t] * ci + ti[t] * cr;
        }
        const o = ob + q + r * s;
        if (r === 0) {
          yr[o] = ur;
          yi[o] = ui;
        } else {
          const w = j * (p - 1) + r - 1;
          yr[o] = ur * wr[w] - ui * wi[w];
          yi[o] = ur * wi[w] + ui * wr[w];
        }
      }
    }
  }
}

function runStockham(plan: StockhamPlan, re: Float64Array, im: Float64Array): void {
  let xr = re, xi = im, yr = plan.yr, yi = plan.yi;
  for (const st of plan.stages) {
    stage(st, xr, xi, yr, yi, plan.tr, plan.ti);
    const t = xr; xr = yr; yr = t;
    const u = xi; xi = yi; yi = u;
  }
  if (xr !== re) {
    re.set(xr);
    im.set(xi);
  }
}

function bluesteinPlan(n: number): BluesteinPlan {
  let m = 1;
  while (m < 2 * n - 1) m <<= 1;
  const inner = getPlan(m) as StockhamPlan;
  const cr = new Float64Array(n);
  const ci = new Float64Array(n);
  const twoN = 2 * n;
  for (let k = 0; k < n; k++) {
    // k² mod 2n keeps the chirp angle small and exact for large k
    const ang = (Math.PI * ((k * k) % twoN)) / n;
    cr[k] = Math.cos(ang);
    ci[k] = -Math.sin(ang);
  }
  const br = new Float64Array(m);
  const bi = new Float64Array(m);
  br[0] = cr[0];
  bi[0] = -ci[0];
  for (let k = 1; k < n; k++) {
    br[k] = br[m - k] = cr[k];
    bi[k] = bi[m - k] = -ci[k];
  }
  runStockham(inner, br, bi);
  const scale = 1 / m; // folds the inverse transform's normalisation into the filter
  for (let k = 0; k < m; k++) {
    br[k] *= scale;
    bi[k] *= scale;
  }
  return { kind: 'bluestein', n, m, inner, cr, ci, br, bi, ar: new Float64Array(m), ai: new Float64Array(m) };
}

function runBluestein(p: BluesteinPlan, re: Float64Array, im: Float64Array): void {
  const { n, m, cr, ci, br, bi, ar, ai } = p;
  for (let k = 0; k < n; k++) {
    ar[k] = re[k] * cr[k] - im[k] * ci[k];
    ai[k] = re[k] * ci[k] + im[k] * cr[k];
  }
  ar.fill(0, n);
  ai.fill(0, n);
  runStockham(p.inner, ar, ai);
  // pointwise product, then the inverse as a forward transform of swapped parts
  for (let k = 0; k < m; k++) {
    const xr = ar[k] * br[k] - ai[k] * bi[k];
    const xi = ar[k] * bi[k] + ai[k] * br[k];
    ar[k] = xi;
    ai[k] = xr;
  }
  runStockham(p.inner, ar, ai);
  for (let k = 0; k < n; k++) {
    const vr = ai[k]; // swap back
    const vi = ar[k];
    re[k] = vr * cr[k] - vi * ci[k];
    im[k] = vr * ci[k] + vi * cr[k];
  }
}

function getPlan(n: number): Plan {
  const cached = plans.get(n);
  if (cached) return cached;
  const radices = factor(n);
  return remember<Plan>(plans, n, radices ? stockhamPlan(n, radices) : bluesteinPlan(n));
}

function forward(re: Float64Array, im: Float64Array): void {
  const n = re.length;
  if (n <= 1) return;
  const plan = getPlan(n);
  if (plan.kind === 'stockham') runStockham(plan, re, im);
  else runBluestein(plan, re, im);
}

/**
 * In-place unnormalised complex FFT of any length; `inverse` uses e^{+j} (a round trip scales by the length).
 */
export function fft(re: Float64Array, im: Float64Array, inverse = false): void {
  if (re.length !== im.length) {
    throw valueError(`fft: real and imaginary parts must have the same length, got ${re.length} and ${im.length}.`);
  }
  // The inverse is the forward transform with real and imaginary parts swapped.
  if (inverse) forward(im, re);
  else forward(re, im);
}

/** Smallest length ≥ n whose prime factors are 2, 3 and 5 only (the fastest lengths for fft). */
export function fastLength(n: number): number {
  let best = Infinity;
  const target = Math.max(1, Math.ceil(n));
  for (let a = 1; a < 2 * target; a *= 5) {
    for (let b = a; b < 2 * target; b *= 3) {
      let c = b;
      while (c < target) c *= 2;
      if (c < best) best = c;
    }
  }
  return best;
}

/* ------------------------------------------------------------------ real signals */

interface RealPlan {
  zr: Float64Array; // half-length complex scratch
  zi: Float64Array;
  cos: Float64Array; // cos(2πn/M), sin(2πn/M) for n = 0..M/2
  sin: Float64Array;
}
const realPlans = new Map<number, RealPlan>();

/** Scratch and half-twiddles for an even real length M. */
function realPlan(M: number): RealPlan {
  const cached = realPlans.get(M);
  if (cached) return cached;
  const h = M / 2;
  const cos = new Float64Array(h + 1);
  const sin = new Float64Array(h + 1);
  for (let n = 0; n <= h; n++) {
    cos[n] = Math.cos((2 * Math.PI * n) / M);
    sin[n] = Math.sin((2 * Math.PI * n) / M);
  }
  return remember(realPlans, M, { zr: new Float64Array(h), zi: new Float64Array(h), cos, sin });
}

const oddScratch = new Map<number, { zr: Float64Array; zi: Float64Array }>();
function complexScratch(n: number): { zr: Float64Array; zi: Float64Array } {
  const cached = oddScratch.get(n);
  if (cached) return cached;
  return remember(oddScratch, n, { zr: new Float64Array(n), zi: new Float64Array(n) });
}

/**
 * One period of M uniform samples → spectrum on f0 with harmonics n = 0..harmonics (≤ floor(M/2)):
 * C_0 = mean, C_n = 2·X[n]/M below Nyquist, X[M/2]/M at the Nyquist row of an even count.
 * Even M uses one complex FFT of length M/2 on the even/odd samples packed as real/imaginary parts.
 */
export function realSpectrum(samples: Float64Array, harmonics: number, f0: number): Spectrum {
  const M = samples.length;
  if (M === 0) throw valueError('samples must hold at least one value.');
  checkHarmonics(harmonics);
  finite(f0, 'f0');
  if (!(f0 > 0)) throw numError(`f0 must be > 0 Hz, got ${f0}.`);
  const nyq = Math.floor(M / 2);
  if (harmonics > nyq) {
    throw numError(`harmonics is ${harmonics}, but ${M} samples per period resolve at most ${nyq} (floor(M/2)).`);
  }
  // One finite sum proves every sample finite and keeps the transform free of overflow. For an even count it
  // is taken while the samples are packed for the half-length transform (one pass over them instead of two).
  const plan = M % 2 === 0 ? realPlan(M) : undefined;
  let sum = 0;
  if (plan) {
    const { zr, zi } = plan;
    for (let k = 0, h = M / 2; k < h; k++) {
      const a = samples[2 * k];
      const b = samples[2 * k + 1];
      zr[k] = a;
      zi[k] = b;
      sum += Math.abs(a) + Math.abs(b);
    }
  } else {
    for (let k = 0; k < M; k++) sum += Math.abs(samples[k]);
  }
  if (!Number.isFinite(sum)) {
    for (let k = 0; k < M; k++) {
      if (!Number.isFinite(samples[k])) throw numError(`samples must be finite numbers; sample ${k + 1} is ${samples[k]}.`);
    }
    throw numError(`samples are too large to transform (the sum of their magnitudes overflows).`);
  }
  const s = makeSpectrum(f0, harmonics);
  const re = s.re;
  const im = s.im;
  const inv = 1 / M;
  if (!plan) {
    const { zr, zi } = complexScratch(M);
    zr.set(samples);
    zi.fill(0);
    forward(zr, zi);
    re[0] = zr[0] * inv;
    for (let n = 1; n <= harmonics; n++) {
      re[n] = 2 * inv * zr[n];
      im[n] = 2 * inv * zi[n];
    }
    return s;
  }
  const h = M / 2;
  const { zr, zi, cos, sin } = plan;
  forward(zr, zi);
  // X[n] = E[n] + e^{−j2πn/M}·O[n], E = (Z[n] + conj Z[h−n])/2, O = (Z[n] − conj Z[h−n])/(2j)
  re[0] = (zr[0] + zi[0]) * inv;
  for (let n = 1; n <= harmonics; n++) {
    const a = n === h ? 0 : n;
    const b = h - n;
    const er = zr[a] + zr[b];
    const ei = zi[a] - zi[b];
    const or = zi[a] + zi[b];
    const oi = zr[b] - zr[a];
    const c = cos[n];
    const sn = -sin[n];
    // 2·X[n]/M with the factors ½ of E and O folded in
    re[n] = inv * (er + c * or - sn * oi);
    im[n] = inv * (ei + c * oi + sn * or);
  }
  if (harmonics === h) {
    re[h] *= 0.5; // Nyquist row: X[M/2]/M, real
    im[h] = 0;
  }
  return s;
}

/**
 * x(t_k) at t_k = k/(points·f0), k = 0..points−1, by one inverse FFT (half length for an even count).
 * Harmonics at or above points/2 fold onto their aliases, so grid values stay exact for any points ≥ 1;
 * points ≥ 2N+1 resolves the waveform. Fastest when points is a power of two or fastLength(points).
 * Writes into `out` when it is long enough (it must not be the spectrum's own re/im arrays); reuses cached
 * scratch, so steady-state calls do not allocate.
 */
export function evaluateOnGrid(s: Spectrum, points: number, out?: Float64Array): Float64Array {
  if (!Number.isInteger(points) || points < 1) throw numError(`points must be a whole number ≥ 1, got ${points}.`);
  const P = points;
  const res = out && out.length >= P ? out : new Float64Array(P);
  const N = order(s);
  const sr = s.re;
  const si = s.im;
  if (P % 2 === 1) {
    const { zr, zi } = complexScratch(P);
    zr.fill(0);
    zi.fill(0);
    zr[0] = sr[0];
    for (let n = 1, a = 1; n <= N; n++, a++) {
      if (a === P) a = 0;
      zr[a] += sr[n];
      zi[a] += si[n];
    }
    forward(zi, zr); // inverse via swapped parts; only the real part is wanted
    for (let k = 0; k < P; k++) res[k] = zr[k];
    return res;
  }
  // Hermitian H[n] (H[n] = C_n/2, H[P−n] = conj C_n/2, H[0] = C_0) folded into Z of half length:
  // Z[i] = (H[i] + H[i+h]) + j·e^{+j2πi/P}·(H[i] − H[i+h]); then x_{2k} + j·x_{2k+1} = IDFT_h(Z)[k].
  const h = P / 2;
  const { zr, zi, cos, sin } = realPlan(P);
  zr.fill(0);
  zi.fill(0);
  // Accumulate the sum part (A = H[i] + H[i+h]) in z and the difference part (D) in res as [Dr | Di].
  const dr = res;
  dr.fill(0, 0, P);
  const addH = (idx: number, vr: number, vi: number): void => {
    if (idx < h) {
      zr[idx] += vr;
      zi[idx] += vi;
      dr[idx] += vr;
      dr[h + idx] += vi;
    } else {
      const i = idx - h;
      zr[i] += vr;
      zi[i] += vi;
      dr[i] -= vr;
      dr[h + i] -= vi;
    }
  };
  addH(0, sr[0], 0);
  if (N < h) {
    // common case, no folding: H[n] = C_n/2 and H[P−n] = conj C_n/2, P − n ≥ h + 1
    for (let n = 1; n <= N; n++) {
      const vr = 0.5 * sr[n];
      const vi = 0.5 * si[n];
      zr[n] += vr;
      zi[n] += vi;
      dr[n] += vr;
      dr[h + n] += vi;
      const i = h - n; // P − n − h
      zr[i] += vr;
      zi[i] -= vi;
      dr[i] -= vr;
      dr[h + i] += vi;
    }
  } else {
    for (let n = 1, a = 1; n <= N; n++, a++) {
      if (a === P) a = 0;
      const vr = 0.5 * sr[n];
      const vi = 0.5 * si[n];
      addH(a, vr, vi);
      addH(a === 0 ? 0 : P - a, vr, -vi);
    }
  }
  for (let i = 0; i < h; i++) {
    // j·e^{+jθ}·D = (−sinθ·Dr − cosθ·Di) + j(cosθ·Dr − sinθ·Di)
    const c = cos[i];
    const sn = sin[i];
    const Dr = dr[i];
    const Di = dr[h + i];
    zr[i] += -sn * Dr - c * Di;
    zi[i] += c * Dr - sn * Di;
  }
  forward(zi, zr); // inverse via swapped parts
  for (let k = 0; k < h; k++) {
    res[2 * k] = zr[k];
    res[2 * k + 1] = zi[k];
  }
  return res;
}
