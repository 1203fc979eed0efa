import { parseLadder } from '../src/core/ladder';
import { elementResponses, response } from '../src/core/response';
import { makeSpectrum, Spectrum } from '../src/core/spectrum';
import { LinearCircuit, meanSquare, periodicSteadyState, sampleSpectrum } from './support/time-domain';

/**
 * The harmonic method (Fourier series of the source × phasor response per harmonic) against an independent
 * time-domain solution: fixed-step RK4 of each circuit's state equations, solved for the periodic steady state
 * by shooting (support/time-domain.ts). Pulse edges fall on RK4 step boundaries, so the integrator's error is
 * far below the series truncation error that sets the tolerances.
 */

/**
 * Pulse train between `low` and `high`, high for 0 ≤ t < D·T: a_n = 2(high − low)·sin(nπD)/(nπ) about the
 * pulse centre D·T/2, so C_n = a_n·e^{−jnπD} (REFERENCES.md, Fourier series
 * of standard waveforms, pulse row; the phase factor places t = 0 at the rising edge).
 */
function pulseSpectrum(low: number, high: number, duty: number, f0: number, N: number): Spectrum {
  const s = makeSpectrum(f0, N);
  const A = high - low;
  s.re[0] = low + A * duty;
  for (let n = 1; n <= N; n++) {
    const a = (2 * A * Math.sin(n * Math.PI * duty)) / (n * Math.PI);
    s.re[n] = a * Math.cos(n * Math.PI * duty);
    s.im[n] = -a * Math.sin(n * Math.PI * duty);
  }
  return s;
}

const rms = (s: Spectrum): number => {
  let p = s.re[0] * s.re[0];
  for (let n = 1; n < s.re.length; n++) p += 0.5 * (s.re[n] * s.re[n] + s.im[n] * s.im[n]);
  return Math.sqrt(p);
};

/** Steps per period of the time-domain reference, and the sample grid (every SKIP-th step) compared with it. */
const STEPS = 4000;
const SKIP = 20;
const sampleTimes = (T: number) => Float64Array.from({ length: STEPS / SKIP }, (_, m) => (m * SKIP * T) / STEPS);

function maxDiff(a: ArrayLike<number>, b: (m: number) => number): number {
  let d = 0;
  for (let m = 0; m < a.length; m++) d = Math.max(d, Math.abs(a[m] - b(m)));
  return d;
}

describe('periodic steady state: harmonic response vs RK4 time-domain integration', () => {
  it('RL: inductor current of a 12 V, 30 % pulse into series L, shunt R', () => {
    const V = 12, D = 0.3, f = 1e3, T = 1 / f, L = 2e-3, R = 10, N = 4000;
    const ladder = parseLadder([['series', 'L', L], ['shunt', 'R', R]]);
    const src = pulseSpectrum(0, V, D, f, N);
    const u = (k: number) => (k < D * STEPS ? V : 0);
    const rl: LinearCircuit = { states: 1, deriv: (x, v, dx) => void (dx[0] = (v - R * x[0]) / L) };
    const { path, closure } = periodicSteadyState(rl, T, STEPS, u);
    expect(closure).toBeLessThan(1e-12);

    const iL = sampleSpectrum(response(src, ladder, { quantity: 'I', element: 0 }), sampleTimes(T));
    // Truncation bound Σ_{n>N} 2V/(nπ·nωL) ≈ 2V/(πωL·N) = 1.5e-4 A on a 0.36 A mean; measured 8e-5 A, at the
    // pulse edges where the current's slope jumps.
    expect(maxDiff(iL, (m) => path[m * SKIP][0])).toBeLessThan(1.5e-4);
    const mean = path.slice(0, STEPS).reduce((a, x) => a + x[0], 0) / STEPS;
    expect(response(src, ladder, { quantity: 'I' }).re[0]).toBeCloseTo((V * D) / R, 12); // DC: L is a short
    expect(mean).toBeCloseTo((V * D) / R, 5);
    // The far-end voltage is R·i; its RMS by Parseval against the integrated RMS (1/n² series: fast).
    const vR = response(src, ladder);
    const tdRms = Math.sqrt(meanSquare(path, u, (x) => R * x[0]));
    expect(Math.abs(rms(vR) - tdRms) / tdRms).toBeLessThan(1e-6);
  });

  it('RC: capacitor voltage and the (jumping) resistor current of a 5 V, 60 % pulse', () => {
    const V = 5, D = 0.6, f = 1e3, T = 1 / f, R = 1e3, C = 1e-7, N = 10000;
    const ladder = parseLadder([['series', 'R', R, 0, 'R1'], ['shunt', 'C', C, 0, 'C1']]);
    const src = pulseSpectrum(0, V, D, f, N);
    const u = (k: number) => (k < D * STEPS ? V : 0);
    const rc: LinearCircuit = { states: 1, deriv: (x, v, dx) => void (dx[0] = (v - x[0]) / (R * C)) };
    const { path, closure } = periodicSteadyState(rc, T, STEPS, u);
    expect(closure).toBeLessThan(1e-12);

    const vC = sampleSpectrum(response(src, ladder), sampleTimes(T));
    // Truncation bound 2V/(π·ωRC·N) = 5e-4 V on a 5 V pulse; measured 2.5e-4 V, at the edges.
    expect(maxDiff(vC, (m) => path[m * SKIP][0])).toBeLessThan(5e-4);
    // The source current jumps with the pulse: its spectrum falls as 1/n, so the RMS converges as 1/√N:
    // the missing tail ½·Σ_{n>N} (2V·sin(nπD)/(nπR))² ≈ 2.5e-10 A² on a mean square near (V/R)²·RC/T = 2.5e-6 A²
    // is 5e-5 of the RMS (measured 5.3e-5).
    const iR = response(src, ladder, { quantity: 'I', element: 0 });
    const tdRms = Math.sqrt(meanSquare(path, u, (x, v) => (v - x[0]) / R));
    expect(Math.abs(rms(iR) - tdRms) / tdRms).toBeLessThan(1e-4);
    expect(rms(response(src, ladder, { quantity: 'I' }))).toBeCloseTo(rms(iR), 15); // the same current
  });

  it('buck output stage: L with DCR, C with ESR, resistive load, 12 V at 200 kHz, D = 0.45', () => {
    // Invented demo values. States: inductor current i, capacitor (internal) voltage v.
    const Vin = 12, D = 0.45, f = 200e3, T = 1 / f, N = 6000;
    const L = 10e-6, dcr = 0.02, C = 22e-6, esr = 0.015, R = 1.2;
    const ladder = parseLadder([
      ['series', 'L', L, 0, 'L1'], ['+', 'R', dcr, 0, 'DCR'],
      ['shunt', 'C', C, 0, 'C1'], ['+', 'R', esr, 0, 'ESR'],
      ['shunt', 'R', R, 0, 'LOAD'],
    ]);
    const src = pulseSpectrum(0, Vin, D, f, N);
    const u = (k: number) => (k < D * STEPS ? Vin : 0);
    const out = (x: Float64Array) => ((x[1] + esr * x[0]) * R) / (R + esr);
    const buck: LinearCircuit = {
      states: 2,
      deriv: (x, v, dx) => {
        const vo = out(x);
        dx[0] = (v - dcr * x[0] - vo) / L;
        dx[1] = (x[0] - vo / R) / C;
      },
    };
    const { path, closure } = periodicSteadyState(buck, T, STEPS, u);
    expect(closure).toBeLessThan(1e-9);

    const e = elementResponses(src, ladder);
    const S = N + 1;
    const row = (r: number, m: 'v' | 'i'): Spectrum => ({
      f0: f,
      re: (m === 'v' ? e.vRe : e.iRe).subarray(r * S, r * S + S),
      im: (m === 'v' ? e.vIm : e.iIm).subarray(r * S, r * S + S),
    });
    const times = sampleTimes(T);
    const iL = sampleSpectrum(row(0, 'i'), times);
    const vo = sampleSpectrum(e.far, times);
    // Inductor current: bound 2·Vin/(π·ωL·N) = 1e-4 A on a 2.5 A ripple (measured 5e-5 A).
    expect(maxDiff(iL, (m) => path[m * SKIP][0])).toBeLessThan(1e-4);
    // Output voltage: the ESR passes the current's 1/n² spectrum, so that bound times ESR (measured 8e-7 V
    // on a 45 mV ripple).
    expect(maxDiff(vo, (m) => out(path[m * SKIP]))).toBeLessThan(3e-6);
    const ppHarmonic = Math.max(...vo) - Math.min(...vo);
    const ppTime = Math.max(...path.map(out)) - Math.min(...path.map(out));
    expect(Math.abs(ppHarmonic - ppTime) / ppTime).toBeLessThan(3e-4); // measured 7e-5
    // Capacitor (= ESR) current: continuous, so its RMS converges fast (measured 3e-7).
    const icTime = Math.sqrt(meanSquare(path, u, (x) => x[0] - out(x) / R));
    expect(rms(row(3, 'i')) / icTime).toBeCloseTo(1, 6);
    // Mean load power and conservation: source power = DCR + ESR + load losses.
    const pLoad = meanSquare(path, u, out) / R;
    const power = (r: number) => {
      const v = row(r, 'v'), i = row(r, 'i');
      let p = v.re[0] * i.re[0];
      for (let n = 1; n <= N; n++) p += 0.5 * (v.re[n] * i.re[n] + v.im[n] * i.im[n]);
      return p;
    };
    expect(power(4) / pLoad).toBeCloseTo(1, 9);
    // DC: the inductor carries the load current, Vout = D·Vin·R/(R + DCR)
    expect(e.far.re[0]).toBeCloseTo((D * Vin * R) / (R + dcr), 12);
  });
});

describe('Hart, Power Electronics (2011), Example 6-1: buck converter, ideal switches (REFERENCES.md)', () => {
  // Vs = 50 V, D = 0.4, L = 400 µH, C = 100 µF, f = 20 kHz, R = 20 Ω →
  // Vo = 20 V, I_L = 1 A, ΔI = 1.5 A, I_max = 1.75 A, I_min = 0.25 A, ΔVo/Vo = 0.469 %.
  const Vs = 50, D = 0.4, L = 400e-6, C = 100e-6, f = 20e3, R = 20, N = 5000;
  const ladder = parseLadder([['series', 'L', '400u', 0, 'L'], ['shunt', 'C', '100u', 0, 'C'], ['shunt', 'R', 20, 0, 'R']]);
  const src = pulseSpectrum(0, Vs, D, f, N);
  const M = 4000; // dense samples per period; t = D·T is on the grid
  const times = Float64Array.from({ length: M }, (_, m) => m / (M * f));
  const iL = sampleSpectrum(response(src, ladder, { quantity: 'I', element: 0 }), times);
  const vo = sampleSpectrum(response(src, ladder), times);
  const max = (a: Float64Array) => a.reduce((x, y) => Math.max(x, y), -Infinity);
  const min = (a: Float64Array) => a.reduce((x, y) => Math.min(x, y), Infinity);
  const mean = (a: Float64Array) => a.reduce((x, y) => x + y, 0) / a.length;

  it('Vo = 20 V and I_L = 1 A on average', () => {
    expect(mean(vo)).toBeCloseTo(20, 9);
    expect(mean(iL)).toBeCloseTo(1, 9);
  });

  // The book's figures are small-ripple approximations (Vo held constant); the exact ripple is 0.12 % larger.
  it('ΔI = 1.5 A, I_max = 1.75 A, I_min = 0.25 A', () => {
    const dI = max(iL) - min(iL);
    expect(Math.abs(dI - 1.5) / 1.5).toBeLessThan(2e-3);
    expect(max(iL)).toBeCloseTo(1.75, 2);
    expect(min(iL)).toBeCloseTo(0.25, 2);
  });

  it('ΔVo/Vo = 0.469 % (ΔV = ΔI/(8fC); the corner 796 Hz is far below 20 kHz, so within 0.5 %)', () => {
    const ripple = (max(vo) - min(vo)) / mean(vo);
    expect(Math.abs(ripple - 0.0046875) / 0.0046875).toBeLessThan(5e-3); // measured 0.4695 %
  });

  it('and the same ripples from the RK4 time-domain reference agree with the harmonic ones', () => {
    const u = (k: number) => (k < D * M ? Vs : 0);
    const circuit: LinearCircuit = {
      states: 2,
      deriv: (x, v, dx) => {
        dx[0] = (v - x[1]) / L;
        dx[1] = (x[0] - x[1] / R) / C;
      },
    };
    const { path, closure } = periodicSteadyState(circuit, 1 / f, M, u);
    expect(closure).toBeLessThan(1e-9);
    const ti = Float64Array.from(path.slice(0, M), (x) => x[0]);
    const tv = Float64Array.from(path.slice(0, M), (x) => x[1]);
    // The current's extremes are its corners, where the series converges slowest: bound 2Vs/(πωL·N) = 1.3e-4 A.
    expect(Math.abs(max(iL) - min(iL) - (max(ti) - min(ti)))).toBeLessThan(2e-4);
    expect(Math.abs(max(vo) - min(vo) - (max(tv) - min(tv)))).toBeLessThan(1e-9); // measured 2e-13 V
  });
});
