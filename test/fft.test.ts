import { complex, fft as mfft, Complex } from 'mathjs';
import { evaluateOnGrid, fastLength, fft, realSpectrum } from '../src/core/fft';
import { HcError } from '../src/core/errors';
import { makeSpectrum } from '../src/core/spectrum';

/** Deterministic pseudo-random values (LCG), so failures repeat. */
function rand(seed: number): () => number {
  let s = seed >>> 0;
  return () => {
    s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
    return s / 4294967296 - 0.5;
  };
}

function randomSignal(n: number, seed: number): [Float64Array, Float64Array] {
  const r = rand(seed);
  const re = new Float64Array(n);
  const im = new Float64Array(n);
  for (let k = 0; k < n; k++) {
    re[k] = r();
    im[k] = r();
  }
  return [re, im];
}

const maxAbs = (a: ArrayLike<number>): number => {
  let m = 0;
  for (let k = 0; k < a.length; k++) m = Math.max(m, Math.abs(a[k]));
  return m;
};

/** Direct DFT with exact table twiddles; sign −1 forward, +1 inverse. */
function directDft(re: Float64Array, im: Float64Array, sign: number): [Float64Array, Float64Array] {
  const n = re.length;
  const c = new Float64Array(n);
  const s = new Float64Array(n);
  for (let m = 0; m < n; m++) {
    c[m] = Math.cos((2 * Math.PI * m) / n);
    s[m] = sign * Math.sin((2 * Math.PI * m) / n);
  }
  const R = new Float64Array(n);
  const I = new Float64Array(n);
  for (let k = 0; k < n; k++) {
    let sr = 0;
    let si = 0;
    for (let j = 0, m = 0; j < n; j++, m += k) {
      if (m >= n) m -= n;
      sr += re[j] * c[m] - im[j] * s[m];
      si += re[j] * s[m] + im[j] * c[m];
    }
    R[k] = sr;
    I[k] = si;
  }
  return [R, I];
}

describe('fft (any length)', () => {
  const mathjsLengths = [1, 2, 3, 5, 7, 8, 12, 100, 1000, 1024, 3 * 1024];
  // Extra shapes: radix 4/2/3/5 mixes, generic small-prime stages (7…31), primes above 31 (Bluestein).
  const lengths = [...mathjsLengths, 4 * 81 * 5, 7 * 11 * 13, 2 * 23 * 29, 62, 9, 25, 6, 10, 20, 37, 997, 2 * 4099];

  test.each(mathjsLengths)('matches mathjs fft at length %i', (n) => {
    // Independent implementation: mathjs fft, common practice, no source.
    const [re, im] = randomSignal(n, n);
    const ref = mfft(Array.from(re, (v, k) => complex(v, im[k]))) as unknown as Complex[];
    fft(re, im);
    let err = 0;
    for (let k = 0; k < n; k++) err = Math.max(err, Math.abs(re[k] - ref[k].re), Math.abs(im[k] - ref[k].im));
    expect(err).toBeLessThan(1e-12 * Math.sqrt(n));
  });

  test.each(lengths)('forward and inverse match a direct DFT at length %i', (n) => {
    // Definition of the DFT, common practice, no source.
    for (const inverse of [false, true]) {
      const [re, im] = randomSignal(n, 7 * n + (inverse ? 1 : 0));
      const [er, ei] = directDft(re, im, inverse ? 1 : -1);
      fft(re, im, inverse);
      let err = 0;
      for (let k = 0; k < n; k++) err = Math.max(err, Math.abs(re[k] - er[k]), Math.abs(im[k] - ei[k]));
      expect(err).toBeLessThan(2e-15 * Math.sqrt(n) * Math.log2(n + 2) * 4);
    }
  });

  test.each(lengths)('round trip returns n·x at length %i', (n) => {
    const [re, im] = randomSignal(n, 3 * n);
    const r0 = re.slice();
    const i0 = im.slice();
    fft(re, im);
    fft(re, im, true);
    let err = 0;
    for (let k = 0; k < n; k++) err = Math.max(err, Math.abs(re[k] / n - r0[k]), Math.abs(im[k] / n - i0[k]));
    expect(err).toBeLessThan(1e-14 * Math.log2(n + 2) * 4);
  });

  test.each(lengths)('Parseval Σ|x|² = Σ|X|²/n at length %i', (n) => {
    // Parseval's theorem for the DFT, common practice, no source.
    const [re, im] = randomSignal(n, 5 * n + 2);
    let ex = 0;
    for (let k = 0; k < n; k++) ex += re[k] * re[k] + im[k] * im[k];
    fft(re, im);
    let eX = 0;
    for (let k = 0; k < n; k++) eX += re[k] * re[k] + im[k] * im[k];
    expect(Math.abs(eX / n - ex) / ex).toBeLessThan(1e-13);
  });

  test('repeated calls reuse the plan and stay exact', () => {
    const [re, im] = randomSignal(96, 11);
    const a = [re.slice(), im.slice()];
    const b = [re.slice(), im.slice()];
    fft(a[0], a[1]);
    fft(b[0], b[1]);
    expect(Array.from(a[0])).toEqual(Array.from(b[0]));
    expect(Array.from(a[1])).toEqual(Array.from(b[1]));
  });

  test('mismatched lengths are a VALUE error', () => {
    expect(() => fft(new Float64Array(4), new Float64Array(3))).toThrow(HcError);
  });
});

describe('realSpectrum', () => {
  // x(t) = 1.5 + 2cos(ωt + 0.3) − 0.7 sin(3ωt) + 0.4cos(5ωt − 1): known phasors, common practice, no source.
  const shape = (t: number): number =>
    1.5 + 2 * Math.cos(2 * Math.PI * t + 0.3) - 0.7 * Math.sin(6 * Math.PI * t) + 0.4 * Math.cos(10 * Math.PI * t - 1);

  test.each([11, 12, 16, 45, 64, 100, 243, 1000])('recovers a known cosine sum from %i samples', (M) => {
    const x = Float64Array.from({ length: M }, (_, k) => shape(k / M));
    const s = realSpectrum(x, 5, 50);
    expect(s.f0).toBe(50);
    expect(s.re.length).toBe(6);
    expect(s.re[0]).toBeCloseTo(1.5, 13);
    expect(s.im[0]).toBe(0);
    expect(s.re[1]).toBeCloseTo(2 * Math.cos(0.3), 13);
    expect(s.im[1]).toBeCloseTo(2 * Math.sin(0.3), 13);
    expect(s.re[2]).toBeCloseTo(0, 13);
    expect(s.im[2]).toBeCloseTo(0, 13);
    expect(s.re[3]).toBeCloseTo(0, 13);
    expect(s.im[3]).toBeCloseTo(0.7, 13); // −0.7 sin = Re(0.7j·e^{j3ωt})
    expect(s.re[5]).toBeCloseTo(0.4 * Math.cos(-1), 13);
    expect(s.im[5]).toBeCloseTo(0.4 * Math.sin(-1), 13);
  });

  test.each([1 << 16, 3 << 15, 5 * 3 * 4096 + 1])('large count %i keeps 1e-13 accuracy', (M) => {
    const x = Float64Array.from({ length: M }, (_, k) => shape(k / M));
    const s = realSpectrum(x, 10000, 1);
    const want = [1.5, 2 * Math.cos(0.3), 0, 0, 0, 0.4 * Math.cos(-1)];
    const wantIm = [0, 2 * Math.sin(0.3), 0, 0.7, 0, 0.4 * Math.sin(-1)];
    let err = 0;
    for (let n = 0; n <= 10000; n++) {
      err = Math.max(err, Math.abs(s.re[n] - (want[n] ?? 0)), Math.abs(s.im[n] - (wantIm[n] ?? 0)));
    }
    expect(err).toBeLessThan(1e-13);
  });

  test('values whose magnitudes overflow when summed are a NUM error, not Infinity', () => {
    expect(() => realSpectrum(Float64Array.of(1e308, 1e308, -1e308, 0), 1, 1)).toThrow(/too large/);
  });

  test('Nyquist row of an even count is X[M/2]/M, real', () => {
    // (−1)^k has amplitude 1 at n = M/2 with cosine phase; common practice, no source.
    for (const M of [2, 6, 8, 30]) {
      const x = Float64Array.from({ length: M }, (_, k) => 0.25 + (k % 2 === 0 ? 1.25 : -1.25));
      const s = realSpectrum(x, M / 2, 1);
      expect(s.re[0]).toBeCloseTo(0.25, 14);
      expect(s.re[M / 2]).toBeCloseTo(1.25, 14);
      expect(s.im[M / 2]).toBe(0);
      for (let n = 1; n < M / 2; n++) expect(Math.hypot(s.re[n], s.im[n])).toBeLessThan(1e-14);
    }
  });

  test('a single sample is DC only', () => {
    const s = realSpectrum(Float64Array.of(3.25), 0, 10);
    expect(s.re[0]).toBe(3.25);
    expect(s.re.length).toBe(1);
  });

  test('too many harmonics is a NUM error naming floor(M/2)', () => {
    const x = new Float64Array(9);
    let err: unknown;
    try {
      realSpectrum(x, 5, 1);
    } catch (e) {
      err = e;
    }
    expect(err).toBeInstanceOf(HcError);
    expect((err as HcError).code).toBe('NUM');
    expect((err as HcError).message).toMatch(/at most 4/);
    expect(() => realSpectrum(new Float64Array(10), 5, 1)).not.toThrow();
    expect(() => realSpectrum(new Float64Array(10), 6, 1)).toThrow(/at most 5/);
  });

  test('bad inputs', () => {
    const code = (f: () => unknown): string | undefined => {
      try {
        f();
      } catch (e) {
        return (e as HcError).code;
      }
      return undefined;
    };
    expect(code(() => realSpectrum(new Float64Array(0), 0, 1))).toBe('VALUE');
    expect(code(() => realSpectrum(Float64Array.of(1, NaN, 2), 1, 1))).toBe('NUM');
    expect(code(() => realSpectrum(new Float64Array(4), 1, 0))).toBe('NUM');
    expect(code(() => realSpectrum(new Float64Array(4), 1.5, 1))).toBe('NUM');
  });
});

describe('evaluateOnGrid', () => {
  const spectrum = (N: number, seed: number) => {
    const r = rand(seed);
    const s = makeSpectrum(60, N);
    s.re[0] = r();
    for (let n = 1; n <= N; n++) {
      s.re[n] = r() / n;
      s.im[n] = r() / n;
    }
    return s;
  };
  const direct = (s: ReturnType<typeof spectrum>, t: number): number => {
    let v = s.re[0];
    const w = 2 * Math.PI * s.f0;
    for (let n = 1; n < s.re.length; n++) v += s.re[n] * Math.cos(n * w * t) - s.im[n] * Math.sin(n * w * t);
    return v;
  };

  test.each([
    [5, 11],
    [5, 16],
    [40, 81],
    [40, 128],
    [40, 100],
    [300, 1024],
    [7, 9], // fewer points than 2N+1: aliases fold, grid values stay exact
    [7, 4],
    [3, 1],
  ])('N = %i on %i points matches the direct sum', (N, P) => {
    const s = spectrum(N, N * 7 + P);
    const y = evaluateOnGrid(s, P);
    expect(y.length).toBe(P);
    let err = 0;
    for (let k = 0; k < P; k++) err = Math.max(err, Math.abs(y[k] - direct(s, k / (P * s.f0))));
    expect(err).toBeLessThan(1e-12);
  });

  test('N = 2000 on 4096 and 4050 points (the PEAK use) matches the direct sum', () => {
    const s = spectrum(2000, 99);
    for (const P of [4096, 4050, 4001]) {
      const y = evaluateOnGrid(s, P);
      let err = 0;
      for (let k = 0; k < P; k += 37) err = Math.max(err, Math.abs(y[k] - direct(s, k / (P * s.f0))));
      expect(err).toBeLessThan(1e-12);
    }
  });

  test('writes into a supplied buffer and agrees with realSpectrum', () => {
    const M = 64;
    const x = Float64Array.from({ length: M }, (_, k) => Math.exp(Math.cos((2 * Math.PI * k) / M)));
    const s = realSpectrum(x, 32, 1);
    const out = new Float64Array(M);
    const y = evaluateOnGrid(s, M, out);
    expect(y).toBe(out);
    for (let k = 0; k < M; k++) expect(y[k]).toBeCloseTo(x[k], 13);
  });

  test('bad point counts are NUM errors', () => {
    expect(() => evaluateOnGrid(makeSpectrum(1, 2), 0)).toThrow(HcError);
    expect(() => evaluateOnGrid(makeSpectrum(1, 2), 2.5)).toThrow(HcError);
  });
});

describe('fastLength', () => {
  test('smallest 2^a·3^b·5^c at or above n', () => {
    expect([1, 2, 7, 11, 17, 4001, 4096, 4097, 10001].map(fastLength)).toEqual([1, 2, 8, 12, 18, 4050, 4096, 4320, 10125]);
    for (let n = 1; n < 3000; n += 13) {
      const m = fastLength(n);
      expect(m).toBeGreaterThanOrEqual(n);
      let r = m;
      for (const p of [2, 3, 5]) while (r % p === 0) r /= p;
      expect(r).toBe(1);
      for (let k = n; k < m; k++) {
        let q = k;
        for (const p of [2, 3, 5]) while (q % p === 0) q /= p;
        expect(q).not.toBe(1);
      }
    }
  });
});
