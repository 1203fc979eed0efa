import { HcError } from '../src/core/errors';
import { LIMITS } from '../src/core/limits';
import { Spectrum } from '../src/core/spectrum';
import { combine, pulse, pwl, ramp, rectified, sampled, sine } from '../src/core/waveforms';

/* ------------------------------------------------------------------ helpers (independent of the code under test) */

const amp = (s: Spectrum, n: number): number => Math.hypot(s.re[n], s.im[n]);

/** x(t) rebuilt by direct summation of the series. */
function at(s: Spectrum, t: number): number {
  const w = 2 * Math.PI * s.f0;
  let v = s.re[0];
  for (let n = 1; n < s.re.length; n++) v += s.re[n] * Math.cos(n * w * t) - s.im[n] * Math.sin(n * w * t);
  return v;
}

/** RMS by Parseval: √(DC² + Σ a_n²/2). */
function rms(s: Spectrum): number {
  let e = s.re[0] * s.re[0];
  for (let n = 1; n < s.re.length; n++) e += (s.re[n] * s.re[n] + s.im[n] * s.im[n]) / 2;
  return Math.sqrt(e);
}

/** THD to the fundamental, DC excluded, from the amplitudes. */
function thd(s: Spectrum): number {
  let e = 0;
  for (let n = 2; n < s.re.length; n++) e += s.re[n] * s.re[n] + s.im[n] * s.im[n];
  return Math.sqrt(e) / amp(s, 1);
}

function maxDiff(a: Spectrum, b: Spectrum): number {
  expect(a.re.length).toBe(b.re.length);
  let d = 0;
  for (let n = 0; n < a.re.length; n++) d = Math.max(d, Math.abs(a.re[n] - b.re[n]), Math.abs(a.im[n] - b.im[n]));
  return d;
}

function codeOf(f: () => unknown): string | undefined {
  try {
    f();
  } catch (e) {
    if (e instanceof HcError) return e.code;
    return 'not HcError: ' + String(e);
  }
  return undefined;
}

/** Periodic piecewise-linear reference shape, evaluated directly (for time-domain and quadrature checks). */
function pwlValue(times: number[], values: number[], T: number, t: number): number {
  const t0 = times[0];
  let u = t0 + ((((t - t0) % T) + T) % T);
  const K = times.length;
  for (let k = 0; k < K; k++) {
    const ta = times[k];
    const tb = k === K - 1 ? t0 + T : times[k + 1];
    const va = values[k];
    const vb = k === K - 1 ? values[0] : values[k + 1];
    if (u >= ta && u < tb) return va + ((vb - va) * (u - ta)) / (tb - ta);
  }
  u = t0;
  return values[0];
}

/* ------------------------------------------------------------------ REFERENCES.md standard-waveform table */

describe('standard waveforms (REFERENCES.md table)', () => {
  const A = 2.5;
  const f = 1000;

  test('square ±A: a_n = 4A/(nπ) odd n, DC 0, RMS A, THD √(π²/8 − 1)', () => {
    const N = 10000;
    const s = pulse(-A, A, 0.5, f, N);
    expect(s.f0).toBe(f);
    expect(s.re.length).toBe(N + 1);
    // M. Puckette, Theory and Technique of Electronic Music, ch. 10 (square series)
    for (let n = 1; n <= 99; n++) {
      expect(amp(s, n)).toBeCloseTo(n % 2 ? (4 * A) / (n * Math.PI) : 0, 14);
    }
    expect(s.re[0]).toBeCloseTo(0, 15); // DC 0 (REFERENCES.md table)
    // RMS A via Parseval; the 1/n² tail beyond N is below 4A²/(π²N) (REFERENCES.md table)
    expect(Math.abs(rms(s) - A) / A).toBeLessThan(1e-4);
    // THD √(π²/8 − 1) = 0.48343: I. Blagouchine and E. Moreau, IEEE Trans. Communications 59(9), 2011
    expect(Math.sqrt((Math.PI * Math.PI) / 8 - 1)).toBeCloseTo(0.48343, 5);
    // the partial sum misses Σ_{odd n>N} 1/n² < 1/(2(N−1)) of THD²
    const sq = Math.sqrt((Math.PI * Math.PI) / 8 - 1);
    expect(sq - thd(s)).toBeGreaterThan(0);
    expect(sq - thd(s)).toBeLessThan(1 / (4 * (N - 1) * thd(s)));
    // Phase: +A just after the rising edge at t = 0 means a pure sine series (C_n = −j·a_n)
    expect(s.im[1]).toBeCloseTo((-4 * A) / Math.PI, 14);
    expect(Math.abs(s.re[1])).toBeLessThan(1e-15);
  });

  test('square partial sums overshoot to the Wilbraham–Gibbs value 2·Si(π)/π = 1.17898', () => {
    // Gibbs phenomenon, REFERENCES.md (Wilbraham–Gibbs constant, e.g. MathWorld)
    const N = 999;
    const s = pulse(-1, 1, 0.5, 1, N);
    let peak = -Infinity;
    for (let k = 1; k <= 300; k++) peak = Math.max(peak, at(s, (k / 300) * (3 / N)));
    expect(peak).toBeCloseTo(1.17898, 3);
  });

  test('triangle ±A: a_n = 8A/(π²n²) odd n, DC 0, RMS A/√3, crest √3, THD √(π⁴/96 − 1)', () => {
    const N = 2000;
    const s = ramp(-A, A, f, N, 0.5);
    // M. Puckette, Theory and Technique of Electronic Music, ch. 10 (triangle series)
    for (let n = 1; n <= 99; n++) {
      expect(amp(s, n)).toBeCloseTo(n % 2 ? (8 * A) / (Math.PI * Math.PI * n * n) : 0, 14);
    }
    expect(Math.abs(s.re[0])).toBeLessThan(1e-15); // DC 0 (REFERENCES.md table)
    expect(rms(s)).toBeCloseTo(A / Math.sqrt(3), 9); // RMS A/√3 (REFERENCES.md table); tail ~ 1/N³
    // crest √3: peak A at t = T/2 (REFERENCES.md table)
    expect(at(s, 0.5 / f) / rms(s)).toBeCloseTo(Math.sqrt(3), 3);
    // THD √(π⁴/96 − 1) = 0.12115: I. Blagouchine and E. Moreau, IEEE Trans. Communications 59(9), 2011
    expect(Math.sqrt(Math.PI ** 4 / 96 - 1)).toBeCloseTo(0.12115, 5);
    expect(thd(s)).toBeCloseTo(Math.sqrt(Math.PI ** 4 / 96 - 1), 9);
    // time domain: −A at t = 0 rising to +A at T/2 (DESIGN §3), within 1e-3·A at N = 2000
    for (let k = 0; k <= 64; k++) {
      const u = k / 64;
      const want = u <= 0.5 ? -A + 4 * A * u : 3 * A - 4 * A * u;
      expect(Math.abs(at(s, u / f) - want)).toBeLessThan(1e-3 * A);
    }
  });

  test('sawtooth ±A: a_n = 2A/(nπ) all n, DC 0, RMS A/√3, THD √(π²/6 − 1)', () => {
    const N = 10000;
    const s = ramp(-A, A, f, N, 1);
    // REFERENCES.md table (sawtooth row; the table lists no separate source for this series)
    for (let n = 1; n <= 99; n++) expect(amp(s, n)).toBeCloseTo((2 * A) / (n * Math.PI), 14);
    expect(Math.abs(s.re[0])).toBeLessThan(1e-15); // DC 0
    expect(Math.abs(rms(s) - A / Math.sqrt(3)) / A).toBeLessThan(1e-4); // RMS A/√3, 1/N tail
    // THD √(π²/6 − 1) = 0.80308: I. Blagouchine and E. Moreau, IEEE Trans. Communications 59(9), 2011
    expect(Math.sqrt((Math.PI * Math.PI) / 6 - 1)).toBeCloseTo(0.80308, 5);
    // the partial sum misses Σ_{n>N} 1/n² < 1/N of THD²
    const st = Math.sqrt((Math.PI * Math.PI) / 6 - 1);
    expect(st - thd(s)).toBeGreaterThan(0);
    expect(st - thd(s)).toBeLessThan(1 / (2 * N * thd(s)));
    // falling sawtooth (rise fraction 0) has the same amplitudes
    const down = ramp(-A, A, f, 50, 0);
    for (let n = 1; n <= 50; n++) expect(amp(down, n)).toBeCloseTo((2 * A) / (n * Math.PI), 14);
  });

  test.each([
    [0.5, 0.483],
    [0.25, 0.922],
    [0.1, 1.911],
  ])('pulse 0…A at duty %f: a_n, DC AD, RMS A√D, crest 1/√D, THD %f', (D, thdTable) => {
    const N = 10000;
    const s = pulse(0, A, D, f, N);
    // REFERENCES.md table (pulse row): a_n = (2A/(nπ))·|sin(nπD)|
    for (let n = 1; n <= 99; n++) {
      expect(amp(s, n)).toBeCloseTo(((2 * A) / (n * Math.PI)) * Math.abs(Math.sin(n * Math.PI * D)), 14);
    }
    expect(s.re[0]).toBeCloseTo(A * D, 14); // DC AD
    expect(Math.abs(rms(s) - A * Math.sqrt(D)) / A).toBeLessThan(1e-4); // RMS A√D, 1/N tail
    expect(A / (A * Math.sqrt(D))).toBeCloseTo(1 / Math.sqrt(D), 12); // crest 1/√D: peak is A by construction
    // THD √(π²D(1−D)/(2 sin²πD) − 1): I. Blagouchine and E. Moreau, IEEE Trans. Communications 59(9), 2011
    const closed = Math.sqrt((Math.PI ** 2 * D * (1 - D)) / (2 * Math.sin(Math.PI * D) ** 2) - 1);
    expect(closed).toBeCloseTo(thdTable, 3);
    expect(thd(s)).toBeCloseTo(closed, 3);
  });

  test('half-wave rectified: Vm/2 at n = 1, 2Vm/(π(n²−1)) even n, DC Vm/π, RMS Vm/2, crest 2, THD √(1 − 8/π²)', () => {
    const Vm = 325;
    const s = rectified(Vm, 50, 2000, 'half');
    expect(s.f0).toBe(50);
    // D. Hart, Power Electronics, McGraw-Hill 2011, ch. 3–4 (rectified sine series, from memory)
    expect(amp(s, 1)).toBeCloseTo(Vm / 2, 12);
    for (let n = 2; n <= 100; n++) {
      expect(amp(s, n)).toBeCloseTo(n % 2 ? 0 : (2 * Vm) / (Math.PI * (n * n - 1)), 12);
    }
    expect(s.re[0]).toBeCloseTo(Vm / Math.PI, 12); // DC Vm/π (Hart, from memory)
    expect(rms(s)).toBeCloseTo(Vm / 2, 7); // RMS Vm/2 (REFERENCES.md table)
    expect(at(s, 0.25 / 50) / rms(s)).toBeCloseTo(2, 4); // crest 2, peak at a quarter line period
    // THD √(1 − 8/π²) = 0.4352: I. Blagouchine and E. Moreau, IEEE Trans. Communications 59(9), 2011
    expect(Math.sqrt(1 - 8 / Math.PI ** 2)).toBeCloseTo(0.4352, 4);
    expect(thd(s)).toBeCloseTo(Math.sqrt(1 - 8 / Math.PI ** 2), 7);
  });

  test('full-wave rectified: 4Vm/(π(n²−1)) even n, DC 2Vm/π, RMS Vm/√2, crest √2', () => {
    const Vm = 170;
    const s = rectified(Vm, 60, 2000);
    // D. Hart, Power Electronics, McGraw-Hill 2011, ch. 3–4 (rectified sine series, from memory)
    for (let n = 1; n <= 100; n++) {
      expect(amp(s, n)).toBeCloseTo(n % 2 ? 0 : (4 * Vm) / (Math.PI * (n * n - 1)), 12);
    }
    expect(s.re[0]).toBeCloseTo((2 * Vm) / Math.PI, 12); // DC 2Vm/π
    expect(rms(s)).toBeCloseTo(Vm / Math.SQRT2, 7); // RMS Vm/√2 (REFERENCES.md table)
    expect(at(s, 0.25 / 60) / rms(s)).toBeCloseTo(Math.SQRT2, 4); // crest √2
  });
});

/* ------------------------------------------------------------------ trapezoid, pwl, sampled */

describe('trapezoidal pulse', () => {
  test.each([
    [0.3, 0.02],
    [0.5, 0.25],
    [0.1, 1e-6],
    [0.8, 0.15],
  ])('matches the sinc·sinc envelope at duty %f, edge %f·T', (D, tr) => {
    // C. Paul, Introduction to Electromagnetic Compatibility, ch. 3 (from memory):
    // c_n = A(τ/T)·sinc(nπτ/T)·sinc(nπt_r/T), |a_n| = 2|c_n|, DC = Aτ/T
    const A = 12;
    const f = 2e5;
    const s = pulse(0, A, D, f, 500, tr / f, tr / f);
    const sinc = (x: number): number => (x === 0 ? 1 : Math.sin(x) / x);
    expect(s.re[0]).toBeCloseTo(A * D, 13);
    for (let n = 1; n <= 500; n++) {
      const a = 2 * Math.abs(A * D * sinc(n * Math.PI * D) * sinc(n * Math.PI * tr));
      expect(Math.abs(amp(s, n) - a)).toBeLessThan(2e-14 * A);
    }
  });

  test('rise = 0 agrees with pwl of the same rectangle; unequal edges agree with pwl of the trapezoid', () => {
    // Two exact methods agree (common practice, no source)
    const T = 1e-3;
    const rect = pulse(1, 4, 0.3, 1 / T, 400);
    const rp = pwl([0, 0, 0.3 * T, 0.3 * T], [1, 4, 4, 1], 400, T);
    expect(maxDiff(rect, rp)).toBeLessThan(1e-14 * 4);

    // trapezoid 50 % points at 0 and 0.3T, rise 0.04T, fall 0.1T, delayed 0.2T
    const tz = pulse(-1, 2, 0.3, 1 / T, 400, 0.04 * T, 0.1 * T, 0.2 * T);
    const tp = pwl([0.18, 0.22, 0.45, 0.55].map((x) => x * T), [-1, 2, 2, -1], 400, T);
    expect(maxDiff(tz, tp)).toBeLessThan(1e-14 * 2);
  });

  test('time domain: the trapezoid is rebuilt from 3000 harmonics', () => {
    // Defined shape (DESIGN §3): 50 % points at 0 and D·T, linear edges (common practice, no source)
    const T = 1;
    const s = pulse(0.5, 3, 0.4, 1 / T, 3000, 0.05, 0.02);
    const ref = (t: number): number => pwlValue([-0.025, 0.025, 0.39, 0.41], [0.5, 3, 3, 0.5], T, t);
    for (const t of [-0.02, -0.01, 0, 0.01, 0.02, 0.1, 0.2, 0.385, 0.4, 0.405, 0.6, 0.9]) {
      expect(Math.abs(at(s, t) - ref(t))).toBeLessThan(1e-3);
    }
  });

  test('a tiny edge loses no digits (no cancellation as the edge → 0)', () => {
    // Exact limit: the series of a 1e-12·T edge differs from the sharp edge by O((nπ·1e-12)²) (from memory)
    const sharp = pulse(0, 1, 0.25, 50, 200);
    const soft = pulse(0, 1, 0.25, 50, 200, 1e-12 / 50, 3e-13 / 50);
    expect(maxDiff(sharp, soft)).toBeLessThan(1e-15);
    const viaPwl = pwl([-0.5e-12, 0.5e-12, 0.25 - 1.5e-13, 0.25 + 1.5e-13], [0, 1, 1, 0], 200, 1);
    let d = 0;
    for (let n = 0; n <= 200; n++) d = Math.max(d, Math.abs(viaPwl.re[n] - sharp.re[n]), Math.abs(viaPwl.im[n] - sharp.im[n]));
    expect(d).toBeLessThan(1e-15);
  });

  test('a tiny duty keeps its relative digits', () => {
    // a_n → 2A·D for nD ≪ 1 (limit of the pulse row of the REFERENCES.md table)
    const D = 1e-9;
    const s = pulse(0, 1, D, 1, 3, 2e-10, 4e-10);
    expect(amp(s, 1) / (2 * D)).toBeCloseTo(1, 12);
    expect(s.re[0]).toBeCloseTo(D, 22);
  });

  test('delay is a phase shift e^{−jnωd} and a time shift', () => {
    // Fourier shift theorem (common practice, no source)
    const f = 1e4;
    const d = 0.37 / f;
    const a = pulse(0, 1, 0.3, f, 50, 0.01 / f, 0.02 / f);
    const b = pulse(0, 1, 0.3, f, 50, 0.01 / f, 0.02 / f, d);
    for (let n = 1; n <= 50; n++) {
      const ph = -2 * Math.PI * n * f * d;
      const er = a.re[n] * Math.cos(ph) - a.im[n] * Math.sin(ph);
      const ei = a.re[n] * Math.sin(ph) + a.im[n] * Math.cos(ph);
      expect(b.re[n]).toBeCloseTo(er, 13);
      expect(b.im[n]).toBeCloseTo(ei, 13);
    }
    for (const t of [0.1, 0.2, 0.5, 0.8]) expect(at(b, t / f + d)).toBeCloseTo(at(a, t / f), 12);
    // a whole number of periods of delay changes nothing
    expect(maxDiff(pulse(0, 1, 0.3, f, 20, 0, 0, 7 / f), pulse(0, 1, 0.3, f, 20))).toBeLessThan(1e-12);
  });

  test('duty 0 and 1 are constants', () => {
    const lo = pulse(-2, 5, 0, 100, 5, 1e-3, 1e-3);
    const hi = pulse(-2, 5, 1, 100, 5);
    expect(lo.re[0]).toBe(-2);
    expect(hi.re[0]).toBe(5);
    for (let n = 1; n <= 5; n++) expect(amp(lo, n) + amp(hi, n)).toBe(0);
  });
});

describe('ramp', () => {
  test.each([0.5, 0.2, 0.9])('time domain at rise fraction %f within 1e-3 from 2000 harmonics', (rho) => {
    // Defined shape (DESIGN §3): low at t = 0, high at ρT, low again at T (common practice, no source)
    const s = ramp(-1, 3, 50, 2000, rho);
    const T = 1 / 50;
    const ref = (t: number): number => pwlValue([0, rho * T], [-1, 3], T, t);
    for (let k = 0; k <= 40; k++) expect(Math.abs(at(s, (k / 40) * T) - ref((k / 40) * T))).toBeLessThan(1e-3 * 4);
    expect(maxDiff(s, pwl([0, rho * T], [-1, 3], 2000, T))).toBeLessThan(1e-13);
  });

  test('sawteeth away from the jump', () => {
    // Rising sawtooth: low at 0, high just before T (DESIGN §3); Gibbs error decays away from the jump
    const up = ramp(0, 1, 1, 5000, 1);
    const down = ramp(0, 1, 1, 5000, 0);
    for (const t of [0.1, 0.3, 0.5, 0.7, 0.9]) {
      expect(at(up, t)).toBeCloseTo(t, 3);
      expect(at(down, t)).toBeCloseTo(1 - t, 3);
    }
    expect(maxDiff(up, pwl([0, 1, 1], [0, 1, 0], 5000, 1))).toBeLessThan(1e-13);
  });
});

describe('rectified', () => {
  test('time domain: |sin| and max(sin, 0) from t = 0 at the start of conduction', () => {
    // Phase convention stated in the doc comment: sine reference (common practice, no source)
    const full = rectified(2, 50, 2000, 'full');
    const half = rectified(2, 50, 2000, 'half');
    for (let k = 0; k < 50; k++) {
      const t = k / 50 / 50;
      expect(Math.abs(at(full, t) - 2 * Math.abs(Math.sin(2 * Math.PI * 50 * t)))).toBeLessThan(1e-3);
      expect(Math.abs(at(half, t) - 2 * Math.max(0, Math.sin(2 * Math.PI * 50 * t)))).toBeLessThan(1e-3);
    }
  });

  test('mode words and errors', () => {
    expect(maxDiff(rectified(1, 50, 10, ' Half ' as 'half'), rectified(1, 50, 10, 'half'))).toBe(0);
    expect(codeOf(() => rectified(1, 50, 10, 'bridge' as 'full'))).toBe('VALUE');
    expect(rectified(1, 50, 0, 'half').re.length).toBe(1);
  });
});

describe('pwl', () => {
  // An invented shape with a jump, a short segment and a slope change
  const T = 2e-3;
  const times = [0.1e-3, 0.1e-3, 0.3e-3, 0.30001e-3, 1.2e-3, 1.7e-3];
  const values = [0, 2, 1.5, -1, 0.5, 0.25];

  test('matches composite Gauss–Legendre quadrature of each segment', () => {
    // Numerical quadrature, 5-point Gauss–Legendre (common practice, no source)
    const N = 60;
    const s = pwl(times, values, N, T);
    const xg = [0, -0.5384693101056831, 0.5384693101056831, -0.906179845938664, 0.906179845938664];
    const wg = [0.5688888888888889, 0.47862867049936647, 0.47862867049936647, 0.23692688505618908, 0.23692688505618908];
    const pts = [...times, times[0] + T];
    const vals = [...values, values[0]];
    for (let n = 0; n <= N; n++) {
      let cr = 0;
      let ci = 0;
      for (let k = 0; k + 1 < pts.length; k++) {
        const a = pts[k];
        const b = pts[k + 1];
        if (b === a) continue;
        const sub = 200;
        for (let j = 0; j < sub; j++) {
          const lo = a + ((b - a) * j) / sub;
          const h = (b - a) / sub;
          for (let g = 0; g < 5; g++) {
            const t = lo + (h / 2) * (1 + xg[g]);
            const v = vals[k] + ((vals[k + 1] - vals[k]) * (t - a)) / (b - a);
            const th = (2 * Math.PI * n * t) / T;
            cr += (h / 2) * wg[g] * v * Math.cos(th);
            ci -= (h / 2) * wg[g] * v * Math.sin(th);
          }
        }
      }
      const w = n === 0 ? 1 / T : 2 / T;
      expect(s.re[n]).toBeCloseTo(w * cr, 12);
      expect(s.im[n]).toBeCloseTo(n === 0 ? 0 : w * ci, 12);
    }
  });

  test('matches sampled() of the same shape at 2^16 samples', () => {
    // Sampling a continuous piecewise-linear shape aliases only O(1/M²) (common practice, no source)
    const ts = [0, 0.2, 0.25, 0.7];
    const vs = [1, 3, -2, 0.5];
    const M = 1 << 16;
    const x = Float64Array.from({ length: M }, (_, k) => pwlValue(ts, vs, 1, k / M));
    const a = pwl(ts, vs, 40, 1);
    const b = sampled(x, M, 40);
    expect(b.f0).toBe(1);
    expect(maxDiff(a, b)).toBeLessThan(1e-8);
  });

  test('period defaults to last − first and closes with a jump', () => {
    // rising sawtooth 0→1 over [0, 1]: series −Σ sin(nωt)/(πn) + 1/2 (REFERENCES.md table, sawtooth row)
    const s = pwl([0, 1], [0, 1], 30);
    expect(s.f0).toBe(1);
    expect(s.re[0]).toBeCloseTo(0.5, 15);
    for (let n = 1; n <= 30; n++) {
      expect(s.re[n]).toBeCloseTo(0, 14);
      expect(s.im[n]).toBeCloseTo(1 / (Math.PI * n), 14);
    }
    // a longer period closes with a ramp back to the first value
    const tri = pwl([0, 0.5], [0, 1], 20, 1);
    expect(maxDiff(tri, ramp(0, 1, 1, 20))).toBeLessThan(1e-15);
    // absolute times: shifting every time by a quarter period rotates phase by −nπ/2
    const sh = pwl([0.25, 0.75], [0, 1], 20, 1);
    for (let n = 1; n <= 20; n++) {
      const ph = (-n * Math.PI) / 2;
      expect(sh.re[n]).toBeCloseTo(tri.re[n] * Math.cos(ph) - tri.im[n] * Math.sin(ph), 14);
      expect(sh.im[n]).toBeCloseTo(tri.re[n] * Math.sin(ph) + tri.im[n] * Math.cos(ph), 14);
    }
  });

  test('Float64Array input and a single point with a period', () => {
    const s = pwl(Float64Array.of(0.3), Float64Array.of(7), 4, 2);
    expect(s.re[0]).toBeCloseTo(7, 14);
    expect(s.f0).toBe(0.5);
    for (let n = 1; n <= 4; n++) expect(amp(s, n)).toBeLessThan(1e-15);
  });

  test('argument errors', () => {
    expect(codeOf(() => pwl([0, 1], [0], 5))).toBe('VALUE');
    expect(codeOf(() => pwl([], [], 5))).toBe('VALUE');
    expect(codeOf(() => pwl([0, 'a' as unknown as number], [0, 1], 5))).toBe('VALUE');
    expect(codeOf(() => pwl([0, NaN], [0, 1], 5))).toBe('VALUE');
    expect(codeOf(() => pwl([0, Infinity], [0, 1], 5))).toBe('NUM');
    expect(codeOf(() => pwl([0, 2, 1], [0, 1, 2], 5))).toBe('NUM'); // decreasing
    expect(codeOf(() => pwl([0, 1, 1, 1], [0, 1, 2, 3], 5))).toBe('NUM'); // a time three times
    expect(codeOf(() => pwl([1, 1], [0, 1], 5))).toBe('NUM'); // no span, no period
    expect(codeOf(() => pwl([0, 2], [0, 1], 5, 1))).toBe('NUM'); // period < span
    expect(codeOf(() => pwl([0, 2], [0, 1], 5, -1))).toBe('NUM');
    expect(codeOf(() => pwl([0, 1], [0, 1], 5.5))).toBe('NUM');
    expect(codeOf(() => pwl([0, 1], [0, 1], LIMITS.harmonics + 1))).toBe('NUM');
    const many = new Float64Array(LIMITS.pwlPoints + 1).map((_, k) => k);
    expect(codeOf(() => pwl(many, many, 1))).toBe('NUM');
    expect(() => pwl([0, 1], [0, 1], 5)).not.toThrow();
  });
});

describe('sampled and sine', () => {
  test('sampled: f0 = sampleRate / count and a known tone', () => {
    // common practice, no source
    const M = 360;
    const fs = 18000;
    const x = Array.from({ length: M }, (_, k) => 0.5 + 3 * Math.cos((2 * Math.PI * 2 * k) / M - Math.PI / 3));
    const s = sampled(x, fs, 10);
    expect(s.f0).toBe(50);
    expect(s.re[0]).toBeCloseTo(0.5, 13);
    expect(amp(s, 2)).toBeCloseTo(3, 13);
    expect(Math.atan2(s.im[2], s.re[2])).toBeCloseTo(-Math.PI / 3, 13);
    expect(codeOf(() => sampled(x, fs, 181))).toBe('NUM');
    expect(codeOf(() => sampled([], fs, 0))).toBe('VALUE');
    expect(codeOf(() => sampled(x, 0, 3))).toBe('NUM');
    expect(codeOf(() => sampled([1, Infinity], 1, 0))).toBe('NUM');
  });

  test('sine: phase in degrees, offset, negative amplitude flips by 180°', () => {
    const s = sine(2, 60, 30, -1);
    expect(s.re.length).toBe(2);
    expect(s.f0).toBe(60);
    expect(s.re[0]).toBe(-1);
    expect(s.re[1]).toBeCloseTo(Math.sqrt(3), 15);
    expect(s.im[1]).toBeCloseTo(1, 15);
    const neg = sine(-2, 60, 30);
    const flip = sine(2, 60, 210);
    expect(maxDiff(neg, flip)).toBeLessThan(1e-15);
    expect(sine(1, 50, 90).re[1]).toBe(0); // exact zero at 90°
    expect(at(s, 1 / 240)).toBeCloseTo(-1 + 2 * Math.cos(Math.PI / 2 + Math.PI / 6), 14);
    expect(codeOf(() => sine(1, -50))).toBe('NUM');
    expect(codeOf(() => sine(1, 50, Infinity))).toBe('NUM');
    expect(codeOf(() => sine('1' as unknown as number, 50))).toBe('VALUE');
  });
});

describe('combine', () => {
  test('50 Hz and 150 Hz → 50 Hz, the 150 Hz rows re-indexed to 3n', () => {
    const a = pulse(0, 1, 0.5, 50, 9);
    const b = sine(0.2, 150, 45, 0.1);
    const c = combine([a, b]);
    expect(c.f0).toBe(50);
    expect(c.re.length).toBe(10);
    expect(c.re[0]).toBeCloseTo(0.5 + 0.1, 15);
    expect(c.re[3]).toBeCloseTo(a.re[3] + b.re[1], 15);
    expect(c.im[3]).toBeCloseTo(a.im[3] + b.im[1], 15);
    expect(c.re[5]).toBe(a.re[5]);
    // time domain: superposition
    for (const t of [1e-3, 3.3e-3, 7e-3]) expect(at(c, t)).toBeCloseTo(at(a, t) + at(b, t), 13);
  });

  test('60 Hz + 100 Hz → 20 Hz (indices 3 and 5)', () => {
    const c = combine([sine(1, 60), sine(2, 100, 30)]);
    expect(c.f0).toBeCloseTo(20, 12);
    expect(c.re.length).toBe(6);
    expect(c.re[3]).toBe(1);
    expect(amp(c, 5)).toBeCloseTo(2, 15);
    expect(amp(c, 1) + amp(c, 2) + amp(c, 4)).toBe(0);
  });

  test('harmonic counts scale: 60 Hz × 10 and 100 Hz × 4 need index 30', () => {
    const c = combine([ramp(0, 1, 60, 10), rectified(1, 100, 4)]);
    expect(c.re.length).toBe(31);
    expect(c.re[20]).toBeCloseTo(rectified(1, 100, 4).re[4], 15);
  });

  test('fundamentals within 1e-9 are treated as equal; DC-only spectra combine with anything', () => {
    const c = combine([sine(1, 50), sine(1, 50 * (1 + 2e-10)), pwl([0], [3], 0, 1), sampled([4], 1, 0)]);
    expect(c.re.length).toBe(2);
    expect(c.re[1]).toBeCloseTo(2, 15);
    expect(c.re[0]).toBe(7);
    const dc = combine([sampled([1, 1], 2, 0)]);
    expect(dc.re.length).toBe(1);
    expect(dc.re[0]).toBe(1);
  });

  test('three fundamentals 50, 75 and 100 Hz share 25 Hz', () => {
    const c = combine([sine(1, 50), sine(2, 75), rectified(1, 100, 2)]);
    expect(c.f0).toBeCloseTo(25, 12);
    expect(c.re.length).toBe(9);
    expect(c.re[2]).toBe(1);
    expect(c.re[3]).toBe(2);
    expect(c.re[8]).toBeCloseTo(rectified(1, 100, 2).re[2], 15);
    expect(c.re[0]).toBeCloseTo((2 / Math.PI) * 1, 15);
  });

  test('errors: no common fundamental within the harmonic limit; bad lists', () => {
    let e: unknown;
    try {
      combine([sine(1, 50), sine(1, 50 * Math.SQRT2)]);
    } catch (x) {
      e = x;
    }
    expect((e as HcError).code).toBe('NUM');
    expect((e as HcError).message).toMatch(/common fundamental/);
    // 1000 Hz and 1001 Hz share 1 Hz, but 10 harmonics of 1001 Hz is index 10010 > limit
    expect(codeOf(() => combine([sine(1, 1000), pulse(0, 1, 0.5, 1001, 10)]))).toBe('NUM');
    expect(codeOf(() => combine([sine(1, 1000), pulse(0, 1, 0.5, 1001, 9)]))).toBeUndefined();
    expect(codeOf(() => combine([]))).toBe('VALUE');
    expect(codeOf(() => combine([{ f0: 1 } as unknown as Spectrum]))).toBe('VALUE');
    expect(codeOf(() => combine(new Array(LIMITS.combine + 1).fill(sine(1, 1))))).toBe('NUM');
  });
});

describe('argument errors (HcError codes)', () => {
  test.each<[string, () => unknown, string]>([
    ['duty > 1', () => pulse(0, 1, 1.5, 50, 5), 'NUM'],
    ['duty NaN', () => pulse(0, 1, NaN, 50, 5), 'VALUE'],
    ['frequency 0', () => pulse(0, 1, 0.5, 0, 5), 'NUM'],
    ['frequency ∞', () => pulse(0, 1, 0.5, Infinity, 5), 'NUM'],
    ['harmonics fractional', () => pulse(0, 1, 0.5, 50, 2.5), 'NUM'],
    ['harmonics negative', () => pulse(0, 1, 0.5, 50, -1), 'NUM'],
    ['harmonics above limit', () => pulse(0, 1, 0.5, 50, LIMITS.harmonics + 1), 'NUM'],
    ['rise negative', () => pulse(0, 1, 0.5, 50, 5, -1e-3), 'NUM'],
    ['edges do not fit', () => pulse(0, 1, 0.2, 50, 5, 3e-3, 6e-3), 'NUM'],
    ['delay text', () => pulse(0, 1, 0.5, 50, 5, 0, 0, 'x' as unknown as number), 'VALUE'],
    ['low ∞', () => pulse(-Infinity, 1, 0.5, 50, 5), 'NUM'],
    ['ramp fraction', () => ramp(0, 1, 50, 5, 1.01), 'NUM'],
    ['ramp frequency', () => ramp(0, 1, -50, 5), 'NUM'],
    ['rectified peak', () => rectified(NaN, 50, 5), 'VALUE'],
    ['rectified frequency', () => rectified(1, 0, 5), 'NUM'],
  ])('%s', (_name, f, code) => {
    expect(codeOf(f)).toBe(code);
  });

  test('overflowing products are a NUM error, never Infinity', () => {
    expect(codeOf(() => pulse(-1e308, 1e308, 0.5, 50, 5))).toBe('NUM');
    expect(codeOf(() => ramp(-1e308, 1e308, 50, 5))).toBe('NUM');
    expect(codeOf(() => rectified(1.5e308, 50, 5))).toBe('NUM');
    expect(codeOf(() => pwl([0, 1], [1e308, -1e308], 5))).toBe('NUM'); // the step of 2e308 (a constant 1e308 is fine)
    expect(codeOf(() => combine([sine(1e308, 50), sine(1e308, 50)]))).toBe('NUM');
  });

  test('edges that exactly fill the shorter time are allowed (a triangle)', () => {
    const tri = pulse(0, 1, 0.5, 1, 30, 0.5, 0.5);
    // the same triangle, rising from 0 at t = −T/4 (ramp starts its rise at t = 0)
    const ref = ramp(0, 1, 1, 30);
    for (let n = 0; n <= 30; n++) expect(amp(tri, n)).toBeCloseTo(amp(ref, n), 15);
  });

  test('messages name the argument and the allowed range', () => {
    try {
      pulse(0, 1, 0.2, 50, 5, 3e-3, 6e-3);
    } catch (e) {
      expect((e as HcError).message).toMatch(/rise and fall/);
      expect((e as HcError).message).toMatch(/min\(duty, 1 − duty\)/);
    }
    try {
      ramp(0, 1, 50, 5, 2);
    } catch (e) {
      expect((e as HcError).message).toMatch(/rise_fraction must be from 0 to 1/);
    }
  });
});
