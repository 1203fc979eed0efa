import { finite, HcError, numError, valueError } from './errors';
import { realSpectrum } from './fft';
import { grouped, LIMITS } from './limits';
import { checkHarmonics, makeSpectrum, order, Spectrum } from './spectrum';

/*
 * Closed-form spectra of standard periodic sources (DESIGN §3). Every function returns harmonics
 * n = 0..N with zero rows included, as phasors C_n with x(t) = Re Σ C_n e^{jnωt}:
 *   C_0 = mean,  C_n = (2/T) ∫_T x(t) e^{−jnωt} dt.
 * All forms are exact integrals, arranged so that no 0/0 or cancellation appears when an edge, a segment
 * or a duty is tiny compared with the period.
 */

/* ---------------------------------------------------------------- small exact helpers */

/** sin(πx) with exact zeros at integers and argument reduction done on x, not on πx. */
export function sinpi(x: number): number {
  let r = x % 2; // (−2, 2)
  if (r > 1) r -= 2;
  else if (r <= -1) r += 2; // (−1, 1]
  if (r === 0 || r === 1) return 0;
  if (r > 0.5) r = 1 - r;
  else if (r < -0.5) r = -1 - r;
  return Math.sin(Math.PI * r);
}

/** cos(πx) with exact zeros at half-integers. */
export function cospi(x: number): number {
  return sinpi(x + 0.5);
}

// Taylor coefficients in x² for |x| < 1, truncated where the next term is below 1e-19 of the sum.
const SINCM1 = new Float64Array(9); // sinc x − 1 = Σ_{k=1..9} (−1)^k x^{2k}/(2k+1)!
const ODD = new Float64Array(9); // (sin x − x cos x)/(2x²) = Σ_{k=1..9} (−1)^{k+1} k x^{2k−1}/(2k+1)!
{
  let f = 1; // (2k+1)!
  for (let k = 1; k <= 9; k++) {
    f *= 2 * k * (2 * k + 1);
    SINCM1[k - 1] = (k % 2 ? -1 : 1) / f;
    ODD[k - 1] = ((k % 2 ? 1 : -1) * k) / f;
  }
}

/** Horner sum of c[0]·y + c[1]·y² + … . */
function series(c: Float64Array, y: number): number {
  let acc = 0;
  for (let k = c.length - 1; k >= 0; k--) acc = (acc + c[k]) * y;
  return acc;
}

/** sinc(x) − 1 = sin(x)/x − 1, accurate for small x (series), so differences of sincs keep their digits. */
function sincm1(x: number): number {
  return Math.abs(x) < 1 ? series(SINCM1, x * x) : Math.sin(x) / x - 1;
}

/**
 * (sin x − x cos x)/(2x²) = ∫_{−1/2}^{1/2} w·sin(2xw) dw, the odd part of a linear segment's integral, for
 * |x| < 1 by its series (the closed form loses digits as 3·eps/x² there).
 */
const oddSeries = (x: number): number => series(ODD, x * x) / x;

/* ---------------------------------------------------------------- argument checks */

function positiveFrequency(f: number, what: string): number {
  finite(f, what);
  if (!(f > 0)) throw numError(`${what} must be > 0 Hz, got ${f}.`);
  return f;
}

function inUnit(x: number, what: string): number {
  finite(x, what);
  if (x < 0 || x > 1) throw numError(`${what} must be from 0 to 1, got ${x}.`);
  return x;
}

function nonNegative(x: number, what: string): number {
  finite(x, what);
  if (x < 0) throw numError(`${what} must be ≥ 0 s, got ${x}.`);
  return x;
}

/** high − low must be a number: levels near ±1.8e308 of opposite sign overflow it. */
function levels(low: number, high: number): void {
  if (!Number.isFinite(high - low)) {
    throw numError(`high − low (${high} − ${low}) exceeds the number range (about 1.8e308); scale the levels down.`);
  }
}

/** Copy a list of numbers into a Float64Array, checking each element. */
function numbers(list: ArrayLike<number>, what: string, max: number): Float64Array {
  if (list === null || typeof list !== 'object' || typeof (list as ArrayLike<number>).length !== 'number') {
    throw valueError(`${what} must be a list of numbers.`);
  }
  const n = list.length;
  if (n > max) throw numError(`${what} holds ${n} values; at most ${max} are allowed.`);
  const out = new Float64Array(n);
  for (let k = 0; k < n; k++) {
    const v = list[k];
    if (typeof v !== 'number' || Number.isNaN(v)) throw valueError(`${what}: element ${k + 1} must be a number.`);
    if (!Number.isFinite(v)) throw numError(`${what}: element ${k + 1} must be finite, got ${v}.`);
    out[k] = v;
  }
  return out;
}

/** Every coefficient finite, or NUM: arguments near the floating-point range can overflow a product. */
function finiteResult(s: Spectrum, what: string): Spectrum {
  for (let n = 0; n < s.re.length; n++) {
    if (!Number.isFinite(s.re[n]) || !Number.isFinite(s.im[n])) {
      throw numError(`${what}: the values are too large to represent (coefficient ${n} overflows); scale them down.`);
    }
  }
  return s;
}

/** Multiply C_n by e^{−jnω·delay} (x(t − delay)); `cycles` = delay·f0. */
function shift(s: Spectrum, cycles: number): void {
  if (cycles === 0) return;
  const N = order(s);
  const frac = cycles - Math.floor(cycles);
  for (let n = 1; n <= N; n++) {
    const u = 2 * ((n * frac) % 1); // phase / π, reduced before scaling to keep digits at large n
    const c = cospi(u);
    const sn = -sinpi(u);
    const r = s.re[n];
    const i = s.im[n];
    s.re[n] = r * c - i * sn;
    s.im[n] = r * sn + i * c;
  }
}

/* ---------------------------------------------------------------- waveforms */

/**
 * Trapezoidal pulse train between `low` and `high`. `duty` is measured between the 50 % points of the
 * edges; `rise` and `fall` are linear edge times (s). t = 0 is the 50 % point of the rising edge, moved
 * to t = delay. With A = high − low and D = duty:
 *   C_n = A/(jπn)·[S_r − e^{−j2πnD}·S_f],  S_r = sinc(πn·rise·f), S_f = sinc(πn·fall·f),
 * evaluated as A/(jπn)(S_r − S_f) + (2A/(πn))·S_f·sin(πnD)·e^{−jπnD} so that short edges and tiny duties
 * keep full precision. Duty 0 or 1 is the constant low or high (edges are then ignored).
 */
export function pulse(
  low: number,
  high: number,
  duty: number,
  frequency: number,
  harmonics: number,
  rise = 0,
  fall = 0,
  delay = 0,
): Spectrum {
  finite(low, 'low');
  finite(high, 'high');
  inUnit(duty, 'duty');
  positiveFrequency(frequency, 'frequency');
  checkHarmonics(harmonics);
  rise = nonNegative(rise ?? 0, 'rise');
  fall = nonNegative(fall ?? 0, 'fall');
  delay = finite(delay ?? 0, 'delay');
  levels(low, high);
  if (!Number.isFinite(delay * frequency)) {
    throw numError(`delay × frequency (${delay} s × ${frequency} Hz) exceeds the number range; give a delay within a period.`);
  }

  const s = makeSpectrum(frequency, harmonics);
  if (duty === 0 || duty === 1) {
    s.re[0] = duty === 0 ? low : high;
    return s;
  }
  const fr = rise * frequency; // edges as fractions of the period
  const ff = fall * frequency;
  const room = Math.min(duty, 1 - duty);
  if ((fr + ff) / 2 > room * (1 + 1e-12)) {
    throw numError(
      `rise and fall do not fit: (rise + fall)/2 = ${(rise + fall) / 2} s must not exceed the shorter of the ` +
        `high and low times (min(duty, 1 − duty)/frequency = ${room / frequency} s).`,
    );
  }
  const A = high - low;
  s.re[0] = low + A * duty;
  for (let n = 1; n <= harmonics; n++) {
    const sr = n * fr;
    const sf = n * ff;
    const dS = sincm1(Math.PI * sr) - sincm1(Math.PI * sf); // S_r − S_f, no cancellation
    const Sf = sf === 0 ? 1 : sinpi(sf) / (Math.PI * sf);
    const nD = (n * duty) % 2;
    const k = ((2 * A) / (Math.PI * n)) * Sf * sinpi(nD);
    // A/(jπn)·dS = −j·A·dS/(πn);  k·e^{−jπnD}
    s.re[n] = k * cospi(nD);
    s.im[n] = -k * sinpi(nD) - (A * dS) / (Math.PI * n);
  }
  shift(s, delay * frequency);
  return finiteResult(s, 'pulse');
}

/**
 * Ramp between `low` and `high`: rises linearly from low at t = 0 to high at t = riseFraction·T, then falls
 * linearly back to low at t = T. 0.5 is a triangle, 1 a rising sawtooth (jump down at the end of the period),
 * 0 a falling sawtooth (jump up at t = 0). With ρ = riseFraction, A = high − low:
 *   C_n = A·e^{−jπnρ}·sin(πnρ) / (jπ²n²ρ(1−ρ)),
 * evaluated on whichever side of ρ = 1/2 avoids 0/0 (sin(πnρ) = (−1)^{n+1} sin(πn(1−ρ))).
 */
export function ramp(low: number, high: number, frequency: number, harmonics: number, riseFraction = 0.5): Spectrum {
  finite(low, 'low');
  finite(high, 'high');
  positiveFrequency(frequency, 'frequency');
  checkHarmonics(harmonics);
  const rho = inUnit(riseFraction ?? 0.5, 'rise_fraction');
  levels(low, high);
  const A = high - low;
  const s = makeSpectrum(frequency, harmonics);
  s.re[0] = low + A / 2;
  const q = 1 - rho;
  for (let n = 1; n <= harmonics; n++) {
    // m = sin(πnρ)/(πn·ρ(1−ρ)) without dividing by a vanishing ρ or 1 − ρ
    let m: number;
    if (rho <= 0.5) {
      const x = n * rho;
      m = (x === 0 ? 1 : sinpi(x) / (Math.PI * x)) / q;
    } else {
      const x = n * q;
      m = ((n % 2 === 0 ? -1 : 1) * (x === 0 ? 1 : sinpi(x) / (Math.PI * x))) / rho;
    }
    const k = (A * m) / (Math.PI * n); // C_n = −j·k·e^{−jπnρ}
    const ph = (n * rho) % 2;
    s.re[n] = -k * sinpi(ph);
    s.im[n] = -k * cospi(ph);
  }
  return finiteResult(s, 'ramp');
}

/**
 * Rectified sine of the given peak on the line frequency f0 (n counts multiples of f0); mode "full" or "half"
 * (case and surrounding spaces ignored).
 * Phase convention: sine reference, t = 0 at the start of a conducting half-cycle:
 *   full: x(t) = peak·|sin ωt| = 2peak/π − Σ_{even n} 4peak/(π(n²−1))·cos nωt
 *   half: x(t) = peak·max(sin ωt, 0) = peak/π + (peak/2)·sin ωt − Σ_{even n} 2peak/(π(n²−1))·cos nωt
 */
export function rectified(peak: number, lineFrequency: number, harmonics: number, mode: string = 'full'): Spectrum {
  finite(peak, 'peak');
  positiveFrequency(lineFrequency, 'line_frequency');
  checkHarmonics(harmonics);
  const m = mode ?? 'full';
  const key = typeof m === 'string' ? m.trim().toLowerCase() : m;
  if (key !== 'full' && key !== 'half') {
    throw valueError(`mode must be "full" or "half", got ${JSON.stringify(mode)}.`);
  }
  const full = key === 'full';
  const s = makeSpectrum(lineFrequency, harmonics);
  const k = full ? (4 * peak) / Math.PI : (2 * peak) / Math.PI;
  s.re[0] = full ? (2 * peak) / Math.PI : peak / Math.PI;
  if (!full && harmonics >= 1) s.im[1] = -peak / 2; // (peak/2)·sin ωt = Re(−j·peak/2·e^{jωt})
  for (let n = 2; n <= harmonics; n += 2) s.re[n] = -k / (n * n - 1);
  return finiteResult(s, 'rectified');
}

/**
 * Exact spectrum of a periodic piecewise-linear waveform through (times[k], values[k]).
 * Times must not decrease; one repeated time is a vertical jump. The period defaults to last − first; the
 * waveform closes with a straight line from the last point to (first time + period, first value), which is a
 * jump when the period equals last − first and the values differ. Times are absolute: t = 0 is time 0.
 * Each segment [ta, tb] contributes, with Δ = tb − ta, midpoint tm, x = nωΔ/2:
 *   ∫ v(t) e^{−jnωt} dt = Δ·e^{−jnω·tm}·[ (va+vb)/2·sinc x − j(vb − va)·(sin x − x cos x)/(2x²) ],
 * both factors evaluated by series when x is small, so short segments keep their digits.
 */
export function pwl(
  times: Float64Array | number[],
  values: Float64Array | number[],
  harmonics: number,
  period?: number,
): Spectrum {
  const t = numbers(times, 'times', LIMITS.pwlPoints);
  const v = numbers(values, 'values', LIMITS.pwlPoints);
  checkHarmonics(harmonics);
  const K = t.length;
  if (K === 0) throw valueError('times and values must hold at least one point.');
  if (K * (harmonics + 1) > LIMITS.pwlWork) {
    throw numError(
      `PWL with ${K} points and ${harmonics} harmonics needs points × (harmonics + 1) = ${grouped(K * (harmonics + 1))} ` +
        `segment terms; at most ${grouped(LIMITS.pwlWork)} are allowed. Use fewer points or fewer harmonics.`,
    );
  }
  if (v.length !== K) {
    throw valueError(`times and values must have the same length, got ${K} times and ${v.length} values.`);
  }
  for (let k = 1; k < K; k++) {
    if (t[k] < t[k - 1]) {
      throw numError(`times must not decrease: point ${k + 1} (${t[k]}) comes before point ${k} (${t[k - 1]}).`);
    }
    if (k >= 2 && t[k] === t[k - 2]) {
      throw numError(`times: point ${k + 1} repeats the time ${t[k]} a third time; a jump uses one repeated time.`);
    }
  }
  const span = t[K - 1] - t[0];
  if (!Number.isFinite(span)) throw numError(`times span ${t[0]} … ${t[K - 1]} s, beyond the number range.`);
  for (let k = 0; k < K; k++) {
    if (!Number.isFinite(v[k] - v[(k + 1) % K])) {
      throw numError(`values: the step from point ${k + 1} exceeds the number range (about 1.8e308); scale the values down.`);
    }
  }
  let T: number;
  if (period === undefined || period === null) {
    if (!(span > 0)) throw numError('times span no time; give a period > 0 or points at different times.');
    T = span;
  } else {
    finite(period, 'period');
    if (!(period > 0) || period < span) {
      throw numError(`period must be > 0 and at least last − first time (${span}), got ${period}.`);
    }
    T = period;
  }
  if (!Number.isFinite(1 / T)) throw numError(`period ${T} is too short.`);

  const s = makeSpectrum(1 / T, harmonics);
  for (let k = 0; k + 1 < K; k++) addSegment(s, T, t[k], t[k + 1] - t[k], v[k], v[k + 1]);
  addSegment(s, T, t[K - 1], T - span, v[K - 1], v[0]); // closing segment, its length taken from T directly
  return finiteResult(s, 'pwl');
}

/** Rotations between exact re-evaluations of the per-harmonic phasors (bounds the recurrence's drift). */
const RESEED = 32;

/**
 * Add the share of C_0..C_N of one linear segment from (ta, va) to (ta + d, vb) (see pwl). The phasors
 * e^{−jnω·tm} and e^{jx_n} advance by one complex rotation per harmonic and are recomputed exactly every
 * RESEED harmonics, which keeps the error near 1e-14 of the segment's share at a fraction of the trig cost.
 */
function addSegment(s: Spectrum, T: number, ta: number, d: number, va: number, vb: number): void {
  if (!(d > 0)) return; // a vertical jump encloses no area
  const re = s.re;
  const im = s.im;
  const N = re.length - 1;
  const w = d / T;
  const vm = 0.5 * va + 0.5 * vb; // halves first: two levels near 1.8e308 do not overflow
  const dv = vb - va;
  re[0] += w * vm;
  if (N === 0) return;
  const tm = ta + 0.5 * d;
  const u = tm / T - Math.floor(tm / T); // midpoint as a fraction of the period
  const x1 = Math.PI * w; // x for n = 1
  const pc = cospi(2 * u); // e^{j2πu}: one harmonic step of the midpoint phase
  const ps = sinpi(2 * u);
  const xc = Math.cos(x1);
  const xs = Math.sin(x1);
  const w2 = 2 * w;
  let c = 0; // cos(2πnu), sin(2πnu)
  let sn = 0;
  let cx = 0; // cos(x_n), sin(x_n)
  let sx = 0;
  for (let n = 1; n <= N; n++) {
    const x = n * x1;
    if (n % RESEED === 1) {
      const ph = 2 * ((n * u) % 1);
      c = cospi(ph);
      sn = sinpi(ph);
      cx = Math.cos(x);
      sx = Math.sin(x);
    } else {
      const c1 = c * pc - sn * ps;
      sn = sn * pc + c * ps;
      c = c1;
      const cx1 = cx * xc - sx * xs;
      sx = sx * xc + cx * xs;
      cx = cx1;
    }
    let S: number;
    let g: number;
    if (x < 1) {
      S = 1 + sincm1(x);
      g = oddSeries(x);
    } else {
      S = sx / x;
      g = (sx - x * cx) / (2 * x * x);
    }
    const br = vm * S;
    const bi = -dv * g;
    // 2w·e^{−j2πnu}·(br + j·bi)
    re[n] += w2 * (c * br + sn * bi);
    im[n] += w2 * (c * bi - sn * br);
  }
}

/** One period of uniform samples at `sampleRate` (f0 = sampleRate / count), by FFT. */
export function sampled(values: Float64Array | number[], sampleRate: number, harmonics: number): Spectrum {
  const x = numbers(values, 'values', LIMITS.samples);
  if (x.length === 0) throw valueError('values must hold at least one sample.');
  positiveFrequency(sampleRate, 'sample_rate');
  checkHarmonics(harmonics);
  const f0 = sampleRate / x.length;
  return realSpectrum(x, harmonics, f0);
}

/**
 * One tone: offset + amplitude·cos(2π·frequency·t + phase). A negative amplitude is the same tone with the
 * phase moved by 180°.
 */
export function sine(amplitude: number, frequency: number, phaseDeg = 0, offset = 0): Spectrum {
  finite(amplitude, 'amplitude');
  positiveFrequency(frequency, 'frequency');
  const ph = finite(phaseDeg ?? 0, 'phase');
  const dc = finite(offset ?? 0, 'offset');
  const s = makeSpectrum(frequency, 1);
  s.re[0] = dc;
  const turns = (ph / 180) % 2;
  s.re[1] = amplitude * cospi(turns);
  s.im[1] = amplitude * sinpi(turns);
  return s;
}

/* ---------------------------------------------------------------- superposition */

const REL_TOL = 1e-9;

/** Best rational p/q ≈ x (> 0) with relative error ≤ REL_TOL and q ≤ maxDen, by continued fractions; null if none. */
function rational(x: number, maxDen: number): [number, number] | null {
  let h0 = 0;
  let h1 = 1;
  let k0 = 1;
  let k1 = 0;
  let r = x;
  for (let i = 0; i < 64; i++) {
    const a = Math.floor(r);
    const h2 = a * h1 + h0;
    const k2 = a * k1 + k0;
    if (k2 > maxDen) return null;
    h0 = h1;
    h1 = h2;
    k0 = k1;
    k1 = k2;
    if (Math.abs(h1 / k1 - x) <= REL_TOL * x) return [h1, k1];
    const frac = r - a;
    if (frac === 0) return null;
    r = 1 / frac;
  }
  return null;
}

const gcd = (a: number, b: number): number => {
  while (b) [a, b] = [b, a % b];
  return a;
};

function checkSpectrum(s: Spectrum, what: string): void {
  const ok =
    s !== null && typeof s === 'object' && s.re instanceof Float64Array && s.im instanceof Float64Array &&
    s.re.length >= 1 && s.re.length === s.im.length && typeof s.f0 === 'number';
  if (!ok) throw valueError(`${what} must be a spectrum.`);
  if (s.re.length > 1 && !(Number.isFinite(s.f0) && s.f0 > 0)) {
    throw numError(`${what} has harmonics but its fundamental ${s.f0} Hz is not a positive number.`);
  }
}

/**
 * Superposition of spectra. Fundamentals may differ when they are integer multiples of a common one (to a
 * relative 1e-9): the result is on the largest such common fundamental and each input is re-indexed onto it.
 * DC-only spectra (N = 0) combine with anything. NUM when no common fundamental keeps the highest harmonic
 * index within LIMITS.harmonics.
 */
export function combine(spectra: Spectrum[]): Spectrum {
  if (!Array.isArray(spectra) || spectra.length === 0) throw valueError('combine needs at least one spectrum.');
  if (spectra.length > LIMITS.combine) {
    throw numError(`combine takes at most ${LIMITS.combine} spectra, got ${spectra.length}.`);
  }
  spectra.forEach((s, i) => checkSpectrum(s, `spectrum ${i + 1}`));
  const tonal = spectra.filter((s) => order(s) > 0);
  if (tonal.length === 0) {
    const f0 = spectra[0].f0;
    const out = makeSpectrum(Number.isFinite(f0) && f0 > 0 ? f0 : 0, 0);
    for (const s of spectra) out.re[0] += s.re[0];
    return finiteResult(out, 'combine');
  }

  // Each tonal fundamental is ref·p/q; the common fundamental is ref·G/Q with Q = lcm(q), G = gcd(p·Q/q).
  const max = LIMITS.harmonics;
  const ref = tonal[0].f0;
  const fail = (other: number): HcError =>
    numError(
      `spectra at ${ref} Hz and ${other} Hz share no common fundamental that keeps every harmonic index ` +
        `within the limit of ${max}; use fundamentals in a simple integer ratio.`,
    );
  const p = new Array<number>(spectra.length).fill(0);
  const q = new Array<number>(spectra.length).fill(1);
  let Q = 1;
  spectra.forEach((s, i) => {
    if (order(s) === 0) return;
    const ratio = s.f0 / ref;
    const pq = ratio <= max ? rational(ratio, max) : null; // a multiple beyond max cannot fit
    if (!pq) throw fail(s.f0);
    [p[i], q[i]] = pq;
    Q = (Q / gcd(Q, q[i])) * q[i];
    if (Q > max) throw fail(s.f0);
  });
  let G = 0;
  spectra.forEach((s, i) => {
    if (order(s) > 0) G = gcd(G, (p[i] * Q) / q[i]);
  });
  const mult = spectra.map((s, i) => (order(s) > 0 ? (p[i] * Q) / q[i] / G : 0));
  let N = 0;
  spectra.forEach((s, i) => {
    N = Math.max(N, order(s) * mult[i]);
  });
  if (N > max) {
    const i = mult.findIndex((m, k) => order(spectra[k]) * m === N);
    throw numError(
      `combining needs harmonic ${N} of the common fundamental ${(ref * G) / Q} Hz (spectrum ${i + 1}, ` +
        `${order(spectra[i])} harmonics of ${spectra[i].f0} Hz), above the limit of ${max}.`,
    );
  }
  // Anchor the common fundamental on the input with the highest harmonic multiple (most digits).
  let best = 0;
  for (let i = 1; i < spectra.length; i++) if (mult[i] > mult[best]) best = i;
  const out = makeSpectrum(spectra[best].f0 / mult[best], N);
  spectra.forEach((s, i) => {
    out.re[0] += s.re[0];
    const m = mult[i];
    for (let n = 1; n <= order(s); n++) {
      out.re[n * m] += s.re[n];
      out.im[n * m] += s.im[n];
    }
  });
  return finiteResult(out, 'combine');
}
