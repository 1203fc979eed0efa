import { parseLadder } from '../src/core/ladder';
import { power, rms } from '../src/core/measures';
import { extremes } from '../src/core/extremes';
import { response } from '../src/core/response';
import { makeSpectrum } from '../src/core/spectrum';
import { stress } from '../src/core/stress';
import { pulse } from '../src/core/waveforms';
import { failure } from './support/failure';


const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);

/*
 * Buck converter power stage of Hart, Power Electronics, Example 6-1 (inputs as listed in REFERENCES.md):
 * Vs = 50 V, D = 0.4, L = 400 µH, C = 100 µF, f = 20 kHz, R = 20 Ω. The switch node is an ideal 0…50 V pulse;
 * the filter corner 1/(2π√(LC)) ≈ 796 Hz is 25× below the switching frequency, so the small-ripple formulas
 * (Erickson and Maksimović, Fundamentals of Power Electronics, ch. 2; TI SLVA477B) should hold to a fraction of
 * a percent: Vo = D·Vs = 20 V, I_L = 1 A, ΔI = (Vs − Vo)·D/(f·L) = 1.5 A, ΔV = ΔI/(8·f·C) = 93.75 mV.
 */
describe('stress: buck output filter against the small-ripple formulas', () => {
  const Vs = 50, D = 0.4, f = 20e3, Lh = 400e-6, Cf = 100e-6, R = 20;
  const Vo = D * Vs;
  const dI = ((Vs - Vo) * D) / (f * Lh);
  const dV = dI / (8 * f * Cf);
  const ladder = parseLadder([
    ['role', 'kind', 'value', 'tol', 'name'],
    ['series', 'L', '400u', 0, 'L1'],
    ['shunt', 'C', '100u', 0, 'C1'],
    ['shunt', 'R', R, 0, 'RL'],
  ]);
  const sw = pulse(0, Vs, D, f, 500);
  const s = stress(sw, ladder);
  const [L1, C1, RL] = [0, 1, 2];

  it('reproduces the worked example\u2019s derived values', () => {
    // Hart Example 6-1 (inputs confirmed, outputs recomputed in REFERENCES.md): ΔI = 1.5 A, I_max = 1.75 A.
    expect(dI).toBeCloseTo(1.5, 12);
    expect(Vo + dV / 2).toBeCloseTo(20.046875, 9);
  });

  it('inductor peak current is I_out + ΔI/2 (Hart Ex. 6-1: I_max = 1.75 A)', () => {
    // Erickson & Maksimović ch. 2 / SLVA477B: I_L,max = I_out + ΔI_pp/2.
    expect(rel(s.iPeak[L1], Vo / R + dI / 2)).toBeLessThan(1e-3);
  });

  it('capacitor RMS current is ΔI_pp/√12', () => {
    // REFERENCES.md buck section (Erickson & Maksimović ch. 2; TI SLVA477B): I_C,rms = ΔI_pp/√12 = 0.4330 A.
    expect(rel(s.iRms[C1], dI / Math.sqrt(12))).toBeLessThan(5e-3);
    // The capacitor carries the triangle's ripple only: its peak is ΔI/2 (same sources).
    expect(rel(s.iPeak[C1], dI / 2)).toBeLessThan(3e-3);
  });

  it('inductor RMS current is √(I² + ΔI²/12) (triangle ripple on DC; common practice, no source)', () => {
    expect(rel(s.iRms[L1], Math.sqrt((Vo / R) ** 2 + dI ** 2 / 12))).toBeLessThan(1e-3);
  });

  it('inductor voltage is Vs − Vo on, −Vo off: peak Vs − (Vo − ΔV/2), RMS √(D(Vs−Vo)² + (1−D)Vo²)', () => {
    // Inductor voltage waveform of the buck under the small-ripple approximation (Erickson & Maksimović ch. 2).
    expect(rel(s.vPeak[L1], Vs - Vo + dV / 2)).toBeLessThan(5e-4);
    expect(rel(s.vRms[L1], Math.sqrt(D * (Vs - Vo) ** 2 + (1 - D) * Vo ** 2))).toBeLessThan(2e-3);
  });

  it('output capacitor voltage peaks at Vo + ΔV/2, ΔV = ΔI/(8fC)', () => {
    // ΔV_pp = ΔI_pp/(8·f·C): Erickson & Maksimović ch. 2; TI SLVA477B. Hart Ex. 6-1: ΔVo/Vo = 0.469 %.
    expect(rel(s.vPeak[C1], Vo + dV / 2)).toBeLessThan(3e-4);
    expect(s.vPeak[C1]).toBe(s.vPeak[RL]); // the two shunts share the output node
    expect(rel(s.vRms[C1], Vo)).toBeLessThan(1e-5);
  });

  it('load resistor dissipates Vo²/R = 20 W, and its power equals V_rms²/R exactly', () => {
    // P = V²/R with Vo = D·Vs (Hart Ex. 6-1: Vo = 20 V): the ripple adds only ~(ΔV/√12)²/R.
    expect(rel(s.power[RL], (Vo * Vo) / R)).toBeLessThan(1e-5);
    expect(rel(s.power[RL], (s.vRms[RL] * s.vRms[RL]) / R)).toBeLessThan(1e-13);
    expect(rel(s.power[RL], s.iRms[RL] * s.iRms[RL] * R)).toBeLessThan(1e-13);
  });

  it('conserves power: source power = Σ resistor powers; reactive parts ≈ 0 (common practice, no source)', () => {
    const src = power(sw, response(sw, ladder, { quantity: 'I' }));
    expect(rel(s.power[RL], src)).toBeLessThan(1e-12);
    expect(Math.abs(s.power[L1])).toBeLessThan(1e-12 * src);
    expect(Math.abs(s.power[C1])).toBeLessThan(1e-12 * src);
  });

  it('prints the measured numbers', () => {
    // Not a check: the report quotes these.
    console.log(
      `buck stress: I_L peak ${s.iPeak[L1]} (1.75), I_C rms ${s.iRms[C1]} (${dI / Math.sqrt(12)}), ` +
        `V_C peak ${s.vPeak[C1]} (${Vo + dV / 2}), P_R ${s.power[RL]} (20)`,
    );
  });
});

describe('stress: agreement with response() and the measures, per element', () => {
  // Invented demo values: a buck output filter with ESR, ESL, DCR and a damped second stage.
  const ladder = parseLadder([
    ['series', 'L', '6u8', 0, 'L1'], ['+', 'R', '12m', 0, 'DCR'],
    ['shunt', 'C', '22u', 0, 'C1'], ['+', 'R', '5m'], ['+', 'L', '1n2'],
    ['series', 'L', '1u'], ['||', 'R', 2],
    ['shunt', 'C', '10u'], ['shunt', 'R', '3.3'],
  ]);
  const sw = pulse(0, 12, 0.3, 400e3, 120, 8e-9, 8e-9);

  it('every row matches rms/extremes/power of response() for that element', () => {
    const s = stress(sw, ladder);
    for (let r = 0; r < ladder.rows; r++) {
      const v = response(sw, ladder, { quantity: 'V', element: r });
      const i = response(sw, ladder, { quantity: 'I', element: r });
      const big = (x: ReturnType<typeof extremes>) => Math.max(Math.abs(x.max), Math.abs(x.min));
      expect(s.vRms[r]).toBeCloseTo(rms(v), 12);
      expect(s.iRms[r]).toBeCloseTo(rms(i), 12);
      expect(s.vPeak[r]).toBeCloseTo(big(extremes(v)), 12);
      expect(s.iPeak[r]).toBeCloseTo(big(extremes(i)), 12);
      expect(s.power[r]).toBeCloseTo(power(v, i), 12);
    }
  });

  it('only resistors absorb power, and their total is the source power', () => {
    const s = stress(sw, ladder);
    const src = power(sw, response(sw, ladder, { quantity: 'I' }));
    let sum = 0;
    for (let r = 0; r < ladder.rows; r++) {
      if (ladder.kind[r] === 0) {
        expect(s.power[r]).toBeGreaterThan(0);
        sum += s.power[r];
      } else expect(Math.abs(s.power[r])).toBeLessThan(1e-12 * src);
    }
    expect(rel(sum, src)).toBeLessThan(1e-12);
  });

  it('honours the values override and a current source', () => {
    const values = Float64Array.from(ladder.value);
    values[8] = 1.1; // heavier load
    const a = stress(sw, ladder, { values });
    const b = stress(sw, ladder);
    expect(a.iRms[8]).toBeGreaterThan(2 * b.iRms[8]);
    // 1 A DC pushed into a resistor-terminated ladder: all of it reaches ground through the shunts.
    const dc = makeSpectrum(1000, 0);
    dc.re[0] = 1;
    const c = stress(dc, ladder, { source: 'current' });
    expect(c.iRms[0]).toBeCloseTo(1, 14);
    expect(c.iRms[2]).toBe(0); // capacitors carry no DC
    expect(c.power[8]).toBeCloseTo(3.3, 12); // I²R: nothing else passes DC to ground
  });

  it('passes network errors through (unbounded source current)', () => {
    const bad = parseLadder([['shunt', 'L', '1m']]);
    const e = failure(() => stress(pulse(0, 1, 0.5, 1000, 10), bad));
    expect(e.code).toBe('NUM');
    expect(e.message).toMatch(/short circuit at DC/);
  });
});
