import { HcError } from '../src/core/errors';
import { crest, mean, power, rms, thd, trace, valueAt } from '../src/core/measures';
import { makeSpectrum, Spectrum } from '../src/core/spectrum';

/* Spectra from closed forms (phasors: x(t) = re[0] + Σ re[n]cos(nωt) − im[n]sin(nωt)). */

const TWO_PI = 2 * Math.PI;

/** Pulse train 0…A, duty D, rising edge at t = 0: (2A/(nπ))·sin(nπD)·e^{−jnπD}. */
function pulse(N: number, A: number, D: number, f0 = 1000): Spectrum {
  const s = makeSpectrum(f0, N);
  s.re[0] = A * D;
  for (let n = 1; n <= N; n++) {
    const a = ((2 * A) / (n * Math.PI)) * Math.sin(n * Math.PI * D);
    s.re[n] = a * Math.cos(n * Math.PI * D);
    s.im[n] = -a * Math.sin(n * Math.PI * D);
  }
  return s;
}

function square(N: number, A: number): Spectrum {
  const s = pulse(N, 2 * A, 0.5);
  s.re[0] -= A;
  return s;
}

function sawtooth(N: number, A: number): Spectrum {
  const s = makeSpectrum(50, N);
  for (let n = 1; n <= N; n++) s.im[n] = (2 * A) / (n * Math.PI);
  return s;
}

function triangle(N: number, A: number): Spectrum {
  const s = makeSpectrum(50, N);
  for (let n = 1; n <= N; n += 2) s.re[n] = (8 * A) / (Math.PI * Math.PI * n * n);
  return s;
}

function halfWave(N: number, Vm: number): Spectrum {
  const s = makeSpectrum(50, N);
  s.re[0] = Vm / Math.PI;
  s.im[1] = -Vm / 2;
  for (let n = 2; n <= N; n += 2) s.re[n] = (-2 * Vm) / (Math.PI * (n * n - 1));
  return s;
}

function fullWave(N: number, Vm: number): Spectrum {
  const s = makeSpectrum(50, N);
  s.re[0] = (2 * Vm) / Math.PI;
  for (let n = 2; n <= N; n += 2) s.re[n] = (-4 * Vm) / (Math.PI * (n * n - 1));
  return s;
}

function rand(seed: number): () => number {
  let s = seed >>> 0;
  return () => {
    s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
    return s / 4294967296 - 0.5;
  };
}

function randomSpectrum(N: number, seed: number, f0 = 60): Spectrum {
  const r = rand(seed);
  const s = makeSpectrum(f0, N);
  s.re[0] = r();
  for (let n = 1; n <= N; n++) {
    s.re[n] = r() / n;
    s.im[n] = r() / n;
  }
  return s;
}

/** Independent evaluation: one cosine per harmonic. */
function direct(s: Spectrum, t: number): number {
  let x = s.re[0];
  for (let n = 1; n < s.re.length; n++) {
    const ph = TWO_PI * n * s.f0 * t;
    x += s.re[n] * Math.cos(ph) - s.im[n] * Math.sin(ph);
  }
  return x;
}

function expectHcError(fn: () => unknown, code: 'VALUE' | 'NUM' | 'NA', message: RegExp): void {
  let err: unknown;
  try {
    fn();
  } catch (e) {
    err = e;
  }
  expect(err).toBeInstanceOf(HcError);
  expect((err as HcError).code).toBe(code);
  expect((err as HcError).message).toMatch(message);
}

const N = 10000; // the 1/n tails still shift RMS and THD in the 5th digit; see the tolerances

describe('published values (REFERENCES.md)', () => {
  test('square ±A: RMS A, crest 1, THD √(π²/8 − 1) = 0.48343', () => {
    const s = square(N, 3);
    // M. Puckette, Theory and Technique of Electronic Music, ch. 10 (square series): RMS A, crest 1
    expect(rms(s)).toBeCloseTo(3, 3);
    expect(crest(s)).toBeCloseTo(1, 3);
    // I. Blagouchine and E. Moreau, IEEE Trans. Communications 59(9), 2011 (THD closed forms)
    expect(Math.abs(thd(s) - Math.sqrt((Math.PI * Math.PI) / 8 - 1))).toBeLessThan(1e-4);
    expect(Math.abs(thd(s) - 0.48343)).toBeLessThan(1e-4);
    expect(mean(s)).toBeCloseTo(0, 12);
  });

  test('triangle ±A: RMS A/√3, crest √3, THD √(π⁴/96 − 1) = 0.12115', () => {
    const s = triangle(2001, 2);
    // M. Puckette, Theory and Technique of Electronic Music, ch. 10 (triangle series)
    expect(rms(s)).toBeCloseTo(2 / Math.sqrt(3), 9);
    expect(crest(s)).toBeCloseTo(Math.sqrt(3), 3);
    // I. Blagouchine and E. Moreau, IEEE Trans. Communications 59(9), 2011 (THD closed forms)
    expect(Math.abs(thd(s) - Math.sqrt(Math.PI ** 4 / 96 - 1))).toBeLessThan(1e-8);
    expect(Math.abs(thd(s) - 0.12115)).toBeLessThan(1e-5);
  });

  test('sawtooth ±A: RMS A/√3, crest √3, THD √(π²/6 − 1) = 0.80308', () => {
    const s = sawtooth(N, 1.5);
    // M. Puckette, Theory and Technique of Electronic Music, ch. 10 (table of standard waveforms)
    expect(Math.abs(rms(s) - 1.5 / Math.sqrt(3))).toBeLessThan(1e-4);
    expect(Math.abs(crest(s) - Math.sqrt(3))).toBeLessThan(1e-4);
    // I. Blagouchine and E. Moreau, IEEE Trans. Communications 59(9), 2011 (THD closed forms)
    expect(Math.abs(thd(s) - 0.80308)).toBeLessThan(1e-4);
  });

  test.each([
    [0.5, 0.483],
    [0.25, 0.922],
    [0.1, 1.911],
  ])('pulse 0…A at duty %f: DC AD, RMS A√D, crest 1/√D, THD %f', (D, printed) => {
    const A = 5;
    const s = pulse(N, A, D);
    // M. Puckette, Theory and Technique of Electronic Music, ch. 10 (pulse series; REFERENCES.md table)
    expect(mean(s)).toBeCloseTo(A * D, 12);
    expect(Math.abs(rms(s) - A * Math.sqrt(D)) / (A * Math.sqrt(D))).toBeLessThan(1e-4);
    expect(Math.abs(crest(s) - 1 / Math.sqrt(D)) * Math.sqrt(D)).toBeLessThan(1e-4);
    // I. Blagouchine and E. Moreau, IEEE Trans. Communications 59(9), 2011 (THD closed forms)
    const closed = Math.sqrt((Math.PI ** 2 * D * (1 - D)) / (2 * Math.sin(Math.PI * D) ** 2) - 1);
    expect(Math.abs(thd(s) - closed)).toBeLessThan(3e-4);
    expect(Math.abs(thd(s) - printed)).toBeLessThan(1e-3);
  });

  test('half-wave rectified, peak Vm: DC Vm/π, RMS Vm/2, crest 2, THD √(1 − 8/π²) = 0.4352', () => {
    const s = halfWave(2000, 325);
    // D. Hart, Power Electronics, McGraw-Hill 2011, ch. 3–4 (rectified sine series, from memory)
    expect(mean(s)).toBeCloseTo(325 / Math.PI, 10);
    expect(rms(s)).toBeCloseTo(325 / 2, 5);
    expect(Math.abs(crest(s) - 2)).toBeLessThan(2e-3); // the partial sum rounds the peak by ~1/N
    // I. Blagouchine and E. Moreau, IEEE Trans. Communications 59(9), 2011 (THD closed forms)
    expect(Math.abs(thd(s) - Math.sqrt(1 - 8 / Math.PI ** 2))).toBeLessThan(1e-8);
    expect(Math.abs(thd(s) - 0.4352)).toBeLessThan(1e-4);
  });

  test('full-wave rectified, peak Vm: DC 2Vm/π, RMS Vm/√2, crest √2', () => {
    const s = fullWave(2000, 10);
    // D. Hart, Power Electronics, McGraw-Hill 2011, ch. 3–4 (rectified sine series, from memory)
    expect(mean(s)).toBeCloseTo(20 / Math.PI, 12);
    expect(rms(s)).toBeCloseTo(10 / Math.SQRT2, 7);
    expect(Math.abs(crest(s) - Math.SQRT2)).toBeLessThan(2e-3);
  });
});

describe('mean and rms', () => {
  test('RMS is Parseval: equals the mean square over one period of samples (common practice, no source)', () => {
    const s = randomSpectrum(40, 5);
    const M = 97; // > 2N: the sampled mean square of a trigonometric polynomial is exact
    let sq = 0;
    let ac = 0;
    for (let k = 0; k < M; k++) {
      const x = direct(s, k / (M * s.f0));
      sq += x * x;
      ac += (x - s.re[0]) ** 2;
    }
    expect(rms(s)).toBeCloseTo(Math.sqrt(sq / M), 13);
    expect(rms(s, true)).toBeCloseTo(Math.sqrt(ac / M), 13);
    expect(rms(s, true)).toBeLessThan(rms(s));
  });

  test('sine of peak A: RMS A/√2; DC only: RMS |DC|; negative mean kept', () => {
    const s = makeSpectrum(50, 3);
    s.re[0] = -2;
    s.im[3] = 4;
    expect(rms(s, true)).toBeCloseTo(4 / Math.SQRT2, 14);
    expect(rms(s)).toBeCloseTo(Math.sqrt(4 + 8), 14);
    expect(mean(s)).toBe(-2);
    const dc = makeSpectrum(0, 0);
    dc.re[0] = -7;
    expect(rms(dc)).toBe(7);
    expect(rms(dc, true)).toBe(0);
  });

  test('compensated, scaled sums keep small harmonics and survive extreme magnitudes', () => {
    const s = makeSpectrum(50, 10000);
    s.re[0] = 1;
    for (let n = 1; n <= 10000; n++) s.re[n] = 1e-9; // each adds 5e-19 to a sum near 1
    expect(Math.abs(rms(s) - 1 - 2.5e-15)).toBeLessThanOrEqual(2.3e-16); // one ulp; a plain running sum returns exactly 1
    const tiny = makeSpectrum(50, 2);
    tiny.re[1] = 1e-200;
    tiny.im[2] = 1e-200;
    expect(rms(tiny) / 1e-200).toBeCloseTo(1, 14);
    const huge = makeSpectrum(50, 2);
    huge.re[1] = 1e300;
    expect(rms(huge)).toBeCloseTo(1e300 / Math.SQRT2, -286);
    huge.re[2] = 1.7e308;
    huge.im[2] = 1.7e308;
    expect(rms(huge) / 1.7e308).toBeCloseTo(1, 14); // √(|C₂|²/2) = 1.7e308 is representable (issue 6)
    huge.re[1] = 1.7e308; // now √((|C₁|² + |C₂|²)/2) ≈ 2.1e308 is not
    expectHcError(() => rms(huge), 'NUM', /too large/);
  });

  test('argument errors', () => {
    expectHcError(() => rms({} as Spectrum), 'VALUE', /spectrum/);
    expectHcError(() => mean({ f0: 50, re: new Float64Array([Infinity]), im: new Float64Array(1) }), 'NUM', /harmonic 0/);
    expectHcError(() => rms(square(10, 1), 'yes' as unknown as boolean), 'VALUE', /ac_only/);
  });
});

describe('thd', () => {
  test('to the RMS: THD_F/√(1 + THD_F²); DC does not count', () => {
    const s = randomSpectrum(30, 8);
    const f = thd(s);
    expect(thd(s, 'rms')).toBeCloseTo(f / Math.sqrt(1 + f * f), 14);
    const shifted = randomSpectrum(30, 8);
    shifted.re[0] += 100;
    expect(thd(shifted)).toBe(f);
    expect(thd(s, 'RMS' as 'rms')).toBe(thd(s, 'rms'));
  });

  test('a pure sine has THD 0; a zero fundamental is an error for the fundamental reference only', () => {
    const s = makeSpectrum(50, 5);
    s.re[1] = 2;
    expect(thd(s)).toBe(0);
    expect(thd(s, 'rms')).toBe(0);
    const noFund = makeSpectrum(50, 3);
    noFund.re[3] = 1;
    expectHcError(() => thd(noFund), 'NUM', /fundamental \(n = 1\) is zero/);
    expect(thd(noFund, 'rms')).toBe(1);
    expectHcError(() => thd(makeSpectrum(50, 3), 'rms'), 'NUM', /no AC part/);
    expectHcError(() => thd(makeSpectrum(0, 0)), 'NUM', /fundamental/);
    const tinyFund = makeSpectrum(50, 2);
    tinyFund.re[1] = 1e-300;
    tinyFund.re[2] = 1e300;
    expectHcError(() => thd(tinyFund), 'NUM', /too large/);
  });

  test('argument errors', () => {
    expectHcError(() => thd(square(9, 1), 'percent' as 'rms'), 'VALUE', /"fundamental" or "rms"/);
  });
});

describe('valueAt and trace', () => {
  test('valueAt matches a direct cosine sum, is periodic, accepts negative times', () => {
    const s = randomSpectrum(500, 3, 50);
    for (const t of [0, 0.0001234, 0.013, 0.019999, -0.0071]) {
      expect(valueAt(s, t)).toBeCloseTo(direct(s, t), 12);
      expect(valueAt(s, t + 0.02 * 7)).toBeCloseTo(valueAt(s, t), 11);
    }
    const dc = makeSpectrum(0, 0);
    dc.re[0] = 4;
    expect(valueAt(dc, 123)).toBe(4);
    expectHcError(() => valueAt(s, NaN), 'VALUE', /time/);
    expectHcError(() => valueAt(s, Infinity), 'NUM', /time/);
  });

  test.each([
    ['FFT grid (whole periods)', 50, 200, 1],
    ['FFT grid (2.5 periods)', 300, 5000, 2.5],
    ['direct sums (small)', 40, 101, 1.2345678],
    ['chirp-z (large, irrational span)', 3000, 4001, 1.2345678],
    ['chirp-z (many periods)', 2000, 9000, 997.3],
  ])('trace via %s: N = %i, %i points over %f periods equal valueAt', (_, n, points, periods) => {
    const s = randomSpectrum(n, n, 60);
    const tr = trace(s, points, periods);
    expect(tr.t.length).toBe(points);
    expect(tr.x.length).toBe(points);
    expect(tr.t[0]).toBe(0);
    expect(tr.t[points - 1]).toBeCloseTo(periods / 60, 12);
    expect(tr.t[1] - tr.t[0]).toBeCloseTo(periods / 60 / (points - 1), 14);
    let err = 0;
    const step = Math.max(1, Math.floor(points / 60));
    for (let k = 0; k < points; k += step) err = Math.max(err, Math.abs(tr.x[k] - direct(s, tr.t[k])));
    expect(err).toBeLessThan(periods > 100 ? 1e-9 : 1e-11);
  });

  test('trace defaults: 200 points over one period, closing on its start', () => {
    const s = randomSpectrum(20, 4, 1000);
    const tr = trace(s);
    expect(tr.t.length).toBe(200);
    expect(tr.t[199]).toBeCloseTo(1e-3, 15);
    expect(tr.x[199]).toBeCloseTo(tr.x[0], 12);
  });

  test('trace argument errors name the bound', () => {
    const s = square(10, 1);
    expectHcError(() => trace(s, 1), 'NUM', /points must be a whole number from 2 to 10000/);
    expectHcError(() => trace(s, 10001), 'NUM', /10000/);
    expectHcError(() => trace(s, 20.5), 'NUM', /whole number/);
    expectHcError(() => trace(s, NaN), 'VALUE', /points/);
    expectHcError(() => trace(s, 100, 0), 'NUM', /periods must be > 0 and at most 1000/);
    expectHcError(() => trace(s, 100, 1001), 'NUM', /periods/);
    expectHcError(() => trace(makeSpectrum(0, 0), 100), 'NUM', /DC-only/);
  });

  test('a DC-only spectrum with a fundamental traces flat', () => {
    const s = makeSpectrum(50, 0);
    s.re[0] = 2.5;
    expect(Array.from(trace(s, 5).x)).toEqual([2.5, 2.5, 2.5, 2.5, 2.5]);
  });
});

describe('power', () => {
  test('a resistor: P = R·I_rms²; equals the time average of v·i (common practice, no source)', () => {
    const i = randomSpectrum(25, 11, 50);
    const R = 4.7;
    const v = makeSpectrum(50, 25);
    for (let n = 0; n <= 25; n++) {
      v.re[n] = R * i.re[n];
      v.im[n] = R * i.im[n];
    }
    expect(power(v, i)).toBeCloseTo(R * rms(i) ** 2, 12);
    const w = randomSpectrum(25, 12, 50);
    const M = 64;
    let avg = 0;
    for (let k = 0; k < M; k++) avg += direct(w, k / (M * 50)) * direct(i, k / (M * 50));
    expect(power(w, i)).toBeCloseTo(avg / M, 12);
  });

  test('90° apart carries no power; only common harmonics count', () => {
    const v = makeSpectrum(50, 3);
    const i = makeSpectrum(50, 1);
    v.re[1] = 10;
    i.im[1] = 2;
    v.re[3] = 5; // no current at n = 3
    expect(power(v, i)).toBe(0);
    i.re[1] = 2;
    v.re[0] = 3;
    i.re[0] = -1;
    expect(power(v, i)).toBeCloseTo(10 - 3, 14);
    expect(power(i, v)).toBeCloseTo(10 - 3, 14);
  });

  test('fundamentals must agree', () => {
    const v = makeSpectrum(50, 3);
    const i = makeSpectrum(60, 3);
    expectHcError(() => power(v, i), 'NUM', /50 Hz\) differs from the current spectrum's \(60 Hz\)/);
    const dc = makeSpectrum(0, 0);
    dc.re[0] = 2;
    v.re[0] = 3;
    expect(power(v, dc)).toBe(6);
    expectHcError(() => power(v, {} as Spectrum), 'VALUE', /current spectrum/);
  });
});

describe('crest', () => {
  test('sine √2; with a DC offset the largest |x| counts', () => {
    const s = makeSpectrum(50, 1);
    s.re[1] = 3;
    expect(crest(s)).toBeCloseTo(Math.SQRT2, 12);
    s.re[0] = -1; // x from −4 to 2
    expect(crest(s)).toBeCloseTo(4 / Math.sqrt(1 + 4.5), 12);
  });

  test('square wave: 1 for the waveform, about 1.179 for its ringing partial sum', () => {
    const s = square(1000, 2);
    expect(crest(s)).toBeCloseTo(1, 3);
    expect(crest(s, { truncated: true })).toBeCloseTo(1.179, 2);
  });

  test('a zero waveform has no crest factor', () => {
    expectHcError(() => crest(makeSpectrum(50, 5)), 'NUM', /RMS is 0/);
  });
});
