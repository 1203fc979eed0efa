import { HcError } from '../src/core/errors';
import { extremes, findJumps, GIBBS_OVERSHOOT, peak, pp, valley } from '../src/core/extremes';
import { makeSpectrum, Spectrum } from '../src/core/spectrum';

/* Spectra built from closed forms (phasors: x(t) = re[0] + Σ re[n]cos(nωt) − im[n]sin(nωt)). */

const TWO_PI = 2 * Math.PI;

/** Add C to harmonic n, delayed by `delay` periods (phasor × e^{−j2πn·delay}). */
function add(s: Spectrum, n: number, cr: number, ci: number, delay = 0): void {
  const c = Math.cos(-TWO_PI * n * delay);
  const sn = Math.sin(-TWO_PI * n * delay);
  s.re[n] += cr * c - ci * sn;
  s.im[n] += cr * sn + ci * c;
}

/** Pulse train low..high, duty D, rising edge at `delay` periods: (2A/(nπ))·sin(nπD)·e^{−jnπD}. */
function pulse(N: number, low: number, high: number, D: number, delay = 0, s = makeSpectrum(1000, N)): Spectrum {
  const A = high - low;
  s.re[0] += low + A * D;
  for (let n = 1; n <= N; n++) {
    const a = ((2 * A) / (n * Math.PI)) * Math.sin(n * Math.PI * D);
    add(s, n, a * Math.cos(-n * Math.PI * D), a * Math.sin(-n * Math.PI * D), delay);
  }
  return s;
}

/** ±A square wave: +A for the first half period after `delay`. */
const square = (N: number, A = 1, delay = 0): Spectrum => pulse(N, -A, A, 0.5, delay);

/** ±A rising sawtooth, falling edge at t = 0: amplitudes 2A/(nπ), all n. */
function sawtooth(N: number, A = 1): Spectrum {
  const s = makeSpectrum(50, N);
  for (let n = 1; n <= N; n++) s.im[n] = (2 * A) / (n * Math.PI);
  return s;
}

/** ±A triangle, peak at t = 0: 8A/(π²n²), odd n. */
function triangle(N: number, A = 1): Spectrum {
  const s = makeSpectrum(50, N);
  for (let n = 1; n <= N; n += 2) s.re[n] = (8 * A) / (Math.PI * Math.PI * n * n);
  return s;
}

/** Full-wave rectified sine of peak Vm (n counts multiples of the line frequency). */
function fullWave(N: number, Vm = 1): Spectrum {
  const s = makeSpectrum(50, N);
  s.re[0] = (2 * Vm) / Math.PI;
  for (let n = 2; n <= N; n += 2) s.re[n] = (-4 * Vm) / (Math.PI * (n * n - 1));
  return s;
}

/** Half-wave rectified sine Vm·max(sin ωt, 0). */
function halfWave(N: number, Vm = 1): Spectrum {
  const s = makeSpectrum(50, N);
  s.re[0] = Vm / Math.PI;
  if (N >= 1) s.im[1] = -Vm / 2;
  for (let n = 2; n <= N; n += 2) s.re[n] = (-2 * Vm) / (Math.PI * (n * n - 1));
  return s;
}

/** Deterministic pseudo-random numbers in [−0.5, 0.5). */
function rand(seed: number): () => number {
  let s = seed >>> 0;
  return () => {
    s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
    return s / 4294967296 - 0.5;
  };
}

/* Independent reference: exact table lookups on an M-point grid, then golden-section refinement with a
   direct cosine sum. Shares no code with the module under test. */

function direct(s: Spectrum, th: number): number {
  let x = s.re[0];
  for (let n = 1; n < s.re.length; n++) x += s.re[n] * Math.cos(n * th) - s.im[n] * Math.sin(n * th);
  return x;
}

function bruteExtremes(s: Spectrum, M: number): { max: number; min: number } {
  const N = s.re.length - 1;
  const cosT = new Float64Array(M);
  const sinT = new Float64Array(M);
  for (let k = 0; k < M; k++) {
    cosT[k] = Math.cos((TWO_PI * k) / M);
    sinT[k] = Math.sin((TWO_PI * k) / M);
  }
  const x = new Float64Array(M).fill(s.re[0]);
  for (let n = 1; n <= N; n++) {
    const a = s.re[n];
    const b = s.im[n];
    if (a === 0 && b === 0) continue;
    for (let k = 0, idx = 0; k < M; k++) {
      x[k] += a * cosT[idx] - b * sinT[idx];
      idx += n;
      if (idx >= M) idx -= M;
    }
  }
  const golden = (sign: number, k: number): number => {
    const h = TWO_PI / M;
    let a = (k - 1) * h;
    let b = (k + 1) * h;
    const g = (Math.sqrt(5) - 1) / 2;
    let c = b - g * (b - a);
    let d = a + g * (b - a);
    let fc = sign * direct(s, c);
    let fd = sign * direct(s, d);
    for (let it = 0; it < 80; it++) {
      if (fc > fd) { b = d; d = c; fd = fc; c = b - g * (b - a); fc = sign * direct(s, c); }
      else { a = c; c = d; fc = fd; d = a + g * (b - a); fd = sign * direct(s, d); }
    }
    return sign * Math.max(fc, fd, sign * x[k]);
  };
  let max = -Infinity;
  let min = Infinity;
  let iMax = 0;
  let iMin = 0;
  for (let k = 0; k < M; k++) {
    if (x[k] > max) { max = x[k]; iMax = k; }
    if (x[k] < min) { min = x[k]; iMin = k; }
  }
  // Refine every grid-local extreme close to the top, not only the best sample.
  let rMax = golden(1, iMax);
  let rMin = golden(-1, iMin);
  const near = 1e-6 * (max - min);
  for (let k = 0; k < M; k++) {
    const p = x[(k + M - 1) % M];
    const q = x[(k + 1) % M];
    if (x[k] >= p && x[k] >= q && x[k] > max - near) rMax = Math.max(rMax, golden(1, k));
    if (x[k] <= p && x[k] <= q && x[k] < min + near) rMin = Math.min(rMin, golden(-1, k));
  }
  return { max: rMax, min: rMin };
}

const relTo = (scale: number) => (a: number, b: number): number => Math.abs(a - b) / scale;

describe('extremes of continuous waveforms (partial sums, to 1e-9 relative)', () => {
  test.each([15, 16, 49, 50, 101, 1000, 10000])('triangle, N = %i: ±Σ a_n at t = 0 and T/2', (N) => {
    // |x(t)| ≤ Σ|a_n| with equality where every cosine is ±1, so the partial sum's extremes are exactly ±Σ a_n.
    const s = triangle(N, 2);
    let sum = 0;
    for (let n = 1; n <= N; n += 2) sum += (8 * 2) / (Math.PI * Math.PI * n * n);
    const e = extremes(s);
    expect(Math.abs(e.max - sum)).toBeLessThan(1e-9 * sum);
    expect(Math.abs(e.min + sum)).toBeLessThan(1e-9 * sum);
    expect(Math.min(e.tMax, 1 / 50 - e.tMax)).toBeLessThan(1e-9 / 50);
    expect(Math.abs(e.tMin - 1 / 100)).toBeLessThan(1e-9 / 50);
  });

  test.each([16, 40, 200, 2000])('full-wave rectified sine, N = %i: valley = DC − Σ|a_n| at t = 0, peak = brute force', (N) => {
    const s = fullWave(N, 325);
    let sum = 0;
    for (let n = 2; n <= N; n += 2) sum += (4 * 325) / (Math.PI * (n * n - 1));
    const e = extremes(s);
    expect(Math.abs(e.min - ((2 * 325) / Math.PI - sum))).toBeLessThan(1e-9 * 325);
    const b = bruteExtremes(s, N <= 200 ? 1 << 17 : 1 << 15);
    expect(Math.abs(e.max - b.max)).toBeLessThan(1e-9 * 325);
  });

  test.each([16, 60, 300])('half-wave rectified sine, N = %i, against brute force', (N) => {
    const s = halfWave(N, 10);
    const e = extremes(s);
    const b = bruteExtremes(s, 1 << 17);
    expect(relTo(10)(e.max, b.max)).toBeLessThan(1e-9);
    expect(relTo(10)(e.min, b.min)).toBeLessThan(1e-9);
  });

  test('cos φ + cos 2φ: max 2, min −9/8 where cos φ = −1/4 (closed form, from memory)', () => {
    for (const delay of [0, 0.1234, 0.77]) {
      const s = makeSpectrum(60, 2);
      add(s, 1, 1, 0, delay);
      add(s, 2, 1, 0, delay);
      const e = extremes(s);
      expect(Math.abs(e.max - 2)).toBeLessThan(1e-12);
      expect(Math.abs(e.min + 9 / 8)).toBeLessThan(1e-12);
      // Minimum at φ = ±acos(−1/4), φ = ωt − 2π·delay.
      const u = (e.tMin * 60 - delay + 1) % 1;
      const want = Math.acos(-0.25) / TWO_PI;
      expect(Math.min(Math.abs(u - want), Math.abs(u - (1 - want)))).toBeLessThan(1e-7);
    }
  });

  test('2 sin φ + sin 2φ: ±3√3/2 at φ = ±π/3 (closed form, from memory)', () => {
    const s = makeSpectrum(1, 2);
    s.im[1] = -2;
    s.im[2] = -1;
    const e = extremes(s);
    expect(Math.abs(e.max - (3 * Math.sqrt(3)) / 2)).toBeLessThan(1e-12);
    expect(Math.abs(e.min + (3 * Math.sqrt(3)) / 2)).toBeLessThan(1e-12);
    expect(Math.abs(e.tMax - 1 / 6)).toBeLessThan(1e-8);
    expect(Math.abs(e.tMin - 5 / 6)).toBeLessThan(1e-8);
  });

  test.each([
    [40, 1e6, 1],
    [300, 1 << 18, 2],
    [120, 1 << 18, 3],
  ])('random smooth spectrum, N = %i, against a %i-point brute force with refinement', (N, M, seed) => {
    const r = rand(seed);
    const s = makeSpectrum(400, N);
    s.re[0] = r();
    for (let n = 1; n <= N; n++) {
      const a = seed === 1 ? Math.exp(-n / 8) : 1 / (n * n * n);
      s.re[n] = a * r();
      s.im[n] = a * r();
    }
    expect(findJumps(s)).toBeNull();
    const e = extremes(s);
    const b = bruteExtremes(s, M);
    const scale = Math.max(Math.abs(b.max), Math.abs(b.min));
    expect(relTo(scale)(e.max, b.max)).toBeLessThan(1e-9);
    expect(relTo(scale)(e.min, b.min)).toBeLessThan(1e-9);
    // The reported times are where those values occur.
    expect(relTo(scale)(direct(s, TWO_PI * 400 * e.tMax), e.max)).toBeLessThan(1e-12);
    expect(relTo(scale)(direct(s, TWO_PI * 400 * e.tMin), e.min)).toBeLessThan(1e-12);
  });

  test('the jump treatment never switches on for 1/n² spectra (triangle, rectified sines)', () => {
    for (const N of [16, 17, 18, 20, 22, 24, 29, 33, 49, 64, 100, 499, 1000, 4000]) {
      for (const s of [triangle(N), fullWave(N), halfWave(N)]) {
        expect(findJumps(s)).toBeNull();
        expect(extremes(s)).toEqual(extremes(s, { truncated: true }));
      }
    }
  });
});

describe('extremes of waveforms with jumps (the waveform, not the ringing)', () => {
  const Ns = [49, 50, 51, 99, 100, 101, 499, 1000, 2000];

  test.each(Ns)('±1 square wave, N = %i, several phases: PEAK within 1.5 % of 1', (N) => {
    for (const delay of [0, 0.1, 0.3183, 0.5, 0.77]) {
      const s = square(N, 1, delay);
      const e = extremes(s);
      expect(Math.abs(e.max - 1)).toBeLessThan(0.015); // the requirement
      expect(Math.abs(e.min + 1)).toBeLessThan(0.015);
      expect(Math.abs(e.max - 1)).toBeLessThan(1e-9); // measured: exact jump spectra come out to rounding
      expect(Math.abs(e.min + 1)).toBeLessThan(1e-9);
      // The peak lies on the high half period.
      const u = (e.tMax * 1000 - delay + 2) % 1;
      expect(u).toBeGreaterThanOrEqual(-1e-9);
      expect(u).toBeLessThanOrEqual(0.5 + 1e-9);
    }
  });

  test.each([0.1, 0.25, 0.5, 0.9])('0…5 V pulse train, duty %f: PEAK 5, VALLEY 0', (D) => {
    for (const N of [49, 100, 1000]) {
      const s = pulse(N, 0, 5, D, 0.2);
      const e = extremes(s);
      expect(Math.abs(e.max - 5)).toBeLessThan(0.015 * 5);
      expect(Math.abs(e.min)).toBeLessThan(0.015 * 5);
      expect(Math.abs(e.max - 5)).toBeLessThan(1e-9);
      expect(Math.abs(e.min)).toBeLessThan(1e-9);
      expect(Math.abs(pp(s) - 5)).toBeLessThan(1e-9);
    }
  });

  test.each([49, 100, 2000])('±1 sawtooth, N = %i: PEAK 1 and VALLEY −1 as limits at the edge', (N) => {
    const s = sawtooth(N, 1);
    const e = extremes(s);
    expect(Math.abs(e.max - 1)).toBeLessThan(1e-9);
    expect(Math.abs(e.min + 1)).toBeLessThan(1e-9);
    expect(e.tMax === 0 || e.tMax === e.tMin).toBe(true); // both one-sided limits sit at the edge, t = 0
  });

  test.each([49, 100, 1000])('pulse plus a smooth ripple, N = %i, against the closed-form waveform', (N) => {
    const s = pulse(N, 0, 5, 0.25, 0.1);
    add(s, 3, 0.4 * Math.cos(0.7), 0.4 * Math.sin(0.7));
    add(s, 5, 0.2 * Math.cos(-1), 0.2 * Math.sin(-1));
    const x = (u: number): number => 0.4 * Math.cos(TWO_PI * 3 * u + 0.7) + 0.2 * Math.cos(TWO_PI * 5 * u - 1);
    // Truth: ripple on each level, the level intervals closed (one-sided limits at the edges).
    let max = -Infinity;
    let min = Infinity;
    const M = 200000;
    for (let k = 0; k <= M; k++) {
      const uHigh = 0.1 + (0.25 * k) / M;
      const uLow = 0.35 + (0.75 * k) / M;
      max = Math.max(max, 5 + x(uHigh), x(uLow));
      min = Math.min(min, 5 + x(uHigh), x(uLow));
    }
    const e = extremes(s);
    expect(Math.abs(e.max - max)).toBeLessThan(0.015 * 5);
    expect(Math.abs(e.min - min)).toBeLessThan(0.015 * 5);
    expect(Math.abs(e.max - max)).toBeLessThan(1e-4); // measured ~1e-13; the grid truth is good to ~1e-5
    expect(Math.abs(e.min - min)).toBeLessThan(1e-4);
  });

  test('a jump with exponential settling (square wave into series R-C, the current)', () => {
    // i(t) jumps by 2/R at each edge and decays with τ = T/10: peak I0 = (2/R)/(1 + e^{−T/2τ}) (from memory).
    const I0 = 2 / (1 + Math.exp(-5));
    for (const [N, tol] of [[49, 2e-3], [501, 2e-5], [5001, 2e-7]]) {
      const s = makeSpectrum(1, N);
      for (let n = 1; n <= N; n += 2) {
        const vi = -4 / (n * Math.PI); // square-wave phasor −j·4/(nπ)
        const zi = -1 / (n * TWO_PI * 0.1); // Z = 1 + 1/(jnωC), ω = 2π, C = 0.1
        const den = 1 + zi * zi;
        s.re[n] = (vi * zi) / den;
        s.im[n] = vi / den;
      }
      const e = extremes(s);
      expect(Math.abs(e.max - I0)).toBeLessThan(tol * I0); // measured 1.4e-3, 1.2e-5, 8e-8
      expect(Math.abs(e.min + I0)).toBeLessThan(tol * I0);
    }
  });

  test('truncated: a ±1 square wave partial sum peaks at 2·Si(π)/π = 1.17898 (Wilbraham–Gibbs constant, e.g. MathWorld)', () => {
    const e = extremes(square(2000), { truncated: true });
    expect(Math.abs(e.max - 1.17898)).toBeLessThan(2e-5);
    expect(Math.abs(e.min + 1.17898)).toBeLessThan(2e-5);
    expect(peak(square(1000), { truncated: true })).toBeGreaterThan(1.178);
  });

  test('truncated: a pulse overshoots by (Si(π)/π − ½)·jump = 0.089490·jump (REFERENCES.md, Gibbs phenomenon)', () => {
    expect(GIBBS_OVERSHOOT).toBeCloseTo(0.08949, 5);
    const e = extremes(pulse(1000, 0, 5, 0.3), { truncated: true });
    expect(Math.abs(e.max - 5 - 0.08949 * 5)).toBeLessThan(2e-3);
    expect(Math.abs(e.min + 0.08949 * 5)).toBeLessThan(2e-3);
  });

  test('findJumps reports the edges of a pulse (places, sizes)', () => {
    const j = findJumps(pulse(200, 0, 5, 0.25, 0.1));
    expect(j).not.toBeNull();
    expect(Array.from(j!.at).map((t) => t / TWO_PI)).toEqual([expect.closeTo(0.1, 9), expect.closeTo(0.35, 9)]);
    expect(Array.from(j!.size)).toEqual([expect.closeTo(5, 9), expect.closeTo(-5, 9)]);
  });
});

describe('safety and edge cases', () => {
  test('spectra that only look like jumps fall back to the partial sum, finite', () => {
    for (const N of [49, 500, 3000]) {
      const r = rand(N);
      const s = makeSpectrum(1, N);
      for (let n = 1; n <= N; n++) {
        const ph = TWO_PI * r();
        s.re[n] = Math.cos(ph) / n;
        s.im[n] = Math.sin(ph) / n;
      }
      const e = extremes(s);
      const raw = extremes(s, { truncated: true });
      for (const v of [e.max, e.min, e.tMax, e.tMin]) expect(Number.isFinite(v)).toBe(true);
      expect(Math.abs(e.max - raw.max)).toBeLessThanOrEqual(GIBBS_OVERSHOOT * 2 * Math.PI);
    }
    // One isolated high tone is not a jump.
    const tone = makeSpectrum(1, 64);
    tone.re[1] = 1;
    tone.re[64] = 0.5;
    expect(findJumps(tone)).toBeNull();
  });

  test('an estimate moves a partial-sum extreme by at most the Gibbs overshoot of its jumps', () => {
    const r = rand(9);
    for (let trial = 0; trial < 6; trial++) {
      const s = pulse(300, 0, 1 + 4 * (r() + 0.5), 0.2 + 0.6 * (r() + 0.5), r());
      for (let n = 1; n <= 6; n++) add(s, n, 0.3 * r(), 0.3 * r());
      const e = extremes(s);
      const raw = extremes(s, { truncated: true });
      const j = findJumps(s)!;
      const bound = GIBBS_OVERSHOOT * j.size.reduce((a, b) => a + Math.abs(b), 0) * 1.05;
      expect(Math.abs(e.max - raw.max)).toBeLessThanOrEqual(bound);
      expect(Math.abs(e.min - raw.min)).toBeLessThanOrEqual(bound);
    }
  });

  test('DC only, zero, a single tone, N = 1', () => {
    const dc = makeSpectrum(0, 0);
    dc.re[0] = -3;
    expect(extremes(dc)).toEqual({ max: -3, tMax: 0, min: -3, tMin: 0 });
    expect(pp(makeSpectrum(50, 10))).toBe(0);
    const one = makeSpectrum(50, 1);
    one.re[0] = 1;
    one.im[1] = -2; // 1 + 2 sin ωt
    const e = extremes(one);
    expect(e.max).toBeCloseTo(3, 14);
    expect(e.min).toBeCloseTo(-1, 14);
    expect(e.tMax).toBeCloseTo(1 / 200, 12);
    expect(e.tMin).toBeCloseTo(3 / 200, 12);
    expect(peak(one)).toBe(e.max);
    expect(valley(one)).toBe(e.min);
  });

  test('argument errors', () => {
    const bad = { f0: 50, re: new Float64Array([0, 1]), im: new Float64Array([0, NaN]) };
    expect(() => extremes(bad)).toThrow(HcError);
    expect(() => extremes(bad)).toThrow(/harmonic 1/);
    expect(() => peak({} as Spectrum)).toThrow(/spectrum/);
    expect(() => extremes(square(50), { truncated: 'yes' as unknown as boolean })).toThrow(/TRUE or FALSE/);
    try {
      extremes({ f0: 0, re: new Float64Array(3), im: new Float64Array(3) });
      throw new Error('no error');
    } catch (e) {
      expect((e as HcError).code).toBe('NUM');
      expect((e as HcError).message).toMatch(/fundamental frequency > 0/);
    }
  });

  test('speed: PEAK of a 2000-harmonic square wave takes milliseconds (a benchmark compares it properly)', () => {
    const s = square(2000, 1, 0.3);
    peak(s);
    const t0 = performance.now();
    for (let i = 0; i < 5; i++) peak(s);
    const each = (performance.now() - t0) / 5;
    expect(each).toBeLessThan(250); // measured ~3 ms on an idle 2-core machine
  });
});
