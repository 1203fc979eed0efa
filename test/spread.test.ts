import { pp } from '../src/core/extremes';
import { LadderTable, parseLadder, withValues } from '../src/core/ladder';
import { LIMITS } from '../src/core/limits';
import { rms } from '../src/core/measures';
import { response, ResponseOptions } from '../src/core/response';
import { makeSpectrum, Spectrum } from '../src/core/spectrum';
import { ladderSeed, MEASURES, spread, Xoshiro128 } from '../src/core/tolerance';
import { pulse } from '../src/core/waveforms';
import { failure } from './support/failure';


const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);

/** Min and max of `measure` over the nominal and every corner, one withValues() ladder at a time. */
function cornersByHand(spec: Spectrum, table: LadderTable, measure: (s: Spectrum) => number, opts: ResponseOptions = {}) {
  const parts = [...table.value.keys()].filter((i) => table.tolerance[i] > 0);
  const nominal = measure(response(spec, table, opts));
  const each: number[] = [];
  for (let c = 0; c < 1 << parts.length; c++) {
    const v = Float64Array.from(table.value);
    parts.forEach((p, j) => (v[p] *= 1 + ((c >> j) & 1 ? 1 : -1) * (table.tolerance[p] / 100)));
    each.push(measure(response(spec, withValues(table, v), opts)));
  }
  return { nominal, each, min: Math.min(nominal, ...each), max: Math.max(nominal, ...each) };
}

// Buck power stage of Hart, Power Electronics, Example 6-1 (Vs = 50 V, D = 0.4, f = 20 kHz, L = 400 µH,
// C = 100 µF, R = 20 Ω); the tolerances are invented.
const hart = parseLadder([
  ['role', 'kind', 'value', 'tol', 'name'],
  ['series', 'L', '400u', 20, 'L1'],
  ['shunt', 'C', '100u', 20, 'C1'],
  ['shunt', 'R', 20, 5, 'RL'],
]);
const sw = pulse(0, 50, 0.4, 20e3, 100);
// Fewer harmonics for the Monte Carlo runs (ripple RMS is within ~1 % of its converged value at N = 30).
const sw30 = pulse(0, 50, 0.4, 20e3, 30);

describe('spread: corners', () => {
  it('equals the corners computed one by one (far-end ripple pp, capacitor RMS current, current source)', () => {
    const a = spread(sw, hart, 'pp');
    const ha = cornersByHand(sw, hart, (s) => pp(s));
    expect(a.method).toBe('corners');
    expect(a.cases).toBe(8);
    expect(rel(a.nominal, ha.nominal)).toBeLessThan(1e-14);
    expect(rel(a.min, ha.min)).toBeLessThan(1e-14);
    expect(rel(a.max, ha.max)).toBeLessThan(1e-14);

    const b = spread(sw, hart, 'rms', { quantity: 'I', element: 1 });
    const hb = cornersByHand(sw, hart, (s) => rms(s), { quantity: 'I', element: 1 });
    expect(rel(b.min, hb.min)).toBeLessThan(1e-14);
    expect(rel(b.max, hb.max)).toBeLessThan(1e-14);

    const src = makeSpectrum(1000, 5);
    for (let n = 1; n <= 5; n++) src.re[n] = 1 / n;
    const c = spread(src, hart, 'acrms', { source: 'current' });
    const hc = cornersByHand(src, hart, (s) => rms(s, true), { source: 'current' });
    expect(rel(c.min, hc.min)).toBeLessThan(1e-14);
    expect(rel(c.max, hc.max)).toBeLessThan(1e-14);
    expect(c.min).toBeLessThan(c.nominal);
    expect(c.max).toBeGreaterThan(c.nominal);
  });

  it('ripple is worst at L and C both −20 %: ΔV/V = (1 − D)/(8·L·C·f²) grows 1/(0.8·0.8)', () => {
    // ΔV/V = (1 − D)/(8LCf²): Erickson & Maksimović ch. 2; TI SLVA477B. Hart Ex. 6-1: ΔVo/Vo = 0.469 %.
    const a = spread(sw, hart, 'pp');
    expect(rel(a.nominal / 20, 0.00469)).toBeLessThan(3e-3);
    expect(rel(a.max / a.nominal, 1 / 0.64)).toBeLessThan(5e-3);
    expect(rel(a.min / a.nominal, 1 / 1.44)).toBeLessThan(5e-3);
    expect(a.maxValues[0]).toBeCloseTo(320e-6, 15);
    expect(a.maxValues[1]).toBeCloseTo(80e-6, 15);
    expect(a.minValues[0]).toBeCloseTo(480e-6, 15);
    expect(a.minValues[1]).toBeCloseTo(120e-6, 15);
  });

  it('applies the tolerances around the values override', () => {
    const values = [200e-6, 47e-6, 10];
    const a = spread(sw, hart, 'peak', { values, quantity: 'I', element: 0 });
    const b = spread(sw, withValues(hart, values), 'peak', { quantity: 'I', element: 0 });
    expect(a).toEqual(b);
    expect(a.nominal).not.toBeCloseTo(spread(sw, hart, 'peak', { quantity: 'I', element: 0 }).nominal, 3);
  });

  it('gives min = nominal = max when no part has a tolerance', () => {
    const t = parseLadder([['series', 'L', '400u'], ['shunt', 'C', '100u'], ['shunt', 'R', 20]]);
    const a = spread(sw, t, 'rms');
    expect(a.cases).toBe(0);
    expect(a.min).toBe(a.nominal);
    expect(a.max).toBe(a.nominal);
  });
});

describe('spread: Monte Carlo', () => {
  it('is repeatable: the same numbers on every call', () => {
    const a = spread(sw30, hart, 'acrms', { trials: 100 });
    const b = spread(sw30, hart, 'acrms', { trials: 100 });
    expect(a.method).toBe('monte-carlo');
    expect(a.cases).toBe(100);
    // A measure that needs the waveform (extremes) repeats as exactly.
    expect(spread(sw30, hart, 'pp', { trials: 20 })).toEqual(spread(sw30, hart, 'pp', { trials: 20 }));
    expect(b).toEqual(a);
  });

  it('stays inside the tolerance box, hence inside the corners for this monotonic measure', () => {
    const mc = spread(sw30, hart, 'acrms', { trials: 100 });
    const corners = spread(sw30, hart, 'acrms');
    expect(mc.nominal).toBe(corners.nominal);
    expect(mc.min).toBeLessThan(mc.nominal);
    expect(mc.max).toBeGreaterThan(mc.nominal);
    expect(mc.max).toBeLessThanOrEqual(corners.max);
    expect(mc.min).toBeGreaterThanOrEqual(corners.min);
    for (const v of [mc.minValues, mc.maxValues]) {
      for (let i = 0; i < 3; i++) {
        const t = hart.tolerance[i] / 100;
        expect(v[i]).toBeGreaterThanOrEqual(hart.value[i] * (1 - t));
        expect(v[i]).toBeLessThanOrEqual(hart.value[i] * (1 + t));
      }
    }
  });

  it('the seed follows the ladder: another seed, or a changed tolerance, gives other boards', () => {
    const a = spread(sw30, hart, 'acrms', { trials: 100 });
    // The default seed is the hash of the ladder, whatever the spectrum or measure.
    expect(spread(sw30, hart, 'acrms', { trials: 100, seed: ladderSeed(hart, hart.value) })).toEqual(a);
    const other = spread(sw30, hart, 'acrms', { trials: 100, seed: 12345 });
    expect(other.max).not.toBe(a.max);
    expect(other.min).not.toBe(a.min);
    // A tolerance change far too small to matter physically still reseeds the draws.
    const tweaked = { ...hart, tolerance: Float64Array.from([20, 20, 5.000000001]) };
    expect(ladderSeed(tweaked, hart.value)).not.toBe(ladderSeed(hart, hart.value));
    const b = spread(sw30, tweaked, 'acrms', { trials: 100 });
    expect(Math.abs(b.max - a.max)).toBeGreaterThan(1e-6 * a.max);
    // A changed value also reseeds.
    const v = Float64Array.from(hart.value);
    v[2] = 20.000001;
    expect(ladderSeed(hart, v)).not.toBe(ladderSeed(hart, hart.value));
  });

  it('more trials extend the same sequence', () => {
    const a = spread(sw30, hart, 'acrms', { trials: 60 });
    const b = spread(sw30, hart, 'acrms', { trials: 120 });
    expect(b.max).toBeGreaterThanOrEqual(a.max);
    expect(b.min).toBeLessThanOrEqual(a.min);
  });

  it('xoshiro128** draws are uniform on [0, 1) (mean 1/2, variance 1/12; common practice, no source)', () => {
    const g = new Xoshiro128(1);
    let s = 0, s2 = 0;
    const n = 20000;
    let outside = 0;
    for (let k = 0; k < n; k++) {
      const u = g.uniform();
      if (!(u >= 0 && u < 1)) outside++;
      s += u;
      s2 += u * u;
    }
    expect(outside).toBe(0);
    expect(Math.abs(s / n - 0.5)).toBeLessThan(0.01);
    expect(Math.abs(s2 / n - (s / n) ** 2 - 1 / 12)).toBeLessThan(0.003);
  });
});

describe('spread: a resonance inside the tolerance band', () => {
  // Invented: a 0…1 V square wave at 1 kHz into a series L–C with a 2 Ω load; L and C ±10 % move the series
  // resonance over 0.91…1.11 × its nominal 3.14 kHz, across the third harmonic (3 kHz). The nominal and every
  // corner (0.91, 1.005, 1.11 ×) sit on the skirts of a Q ≈ 100 resonance; only interior points hit it.
  const sq = pulse(0, 1, 0.5, 1000, 15);
  const L = 10e-3;
  const C = 1 / ((2 * Math.PI * (3000 / 0.955)) ** 2 * L);
  const lc = parseLadder([['series', 'L', L, 10, 'L1'], ['+', 'C', C, 10, 'C1'], ['shunt', 'R', 2, 0, 'RL']]);
  // Third harmonic of the 0…1 square: (2/(3π))·|sin(3π/2)| (pulse row of REFERENCES.md, Puckette ch. 10).
  const a3 = 2 / (3 * Math.PI);

  it('the corners miss the peak; Monte Carlo finds it', () => {
    const corners = spread(sq, lc, 'rms');
    const hand = cornersByHand(sq, lc, (s) => rms(s));
    expect(rel(corners.max, hand.max)).toBeLessThan(1e-14);
    const mc = spread(sq, lc, 'rms', { trials: 1000 });
    // At resonance the whole third harmonic reaches the load: rms ≥ a3/√2 = 0.150 V.
    expect(mc.max).toBeGreaterThan(0.95 * (a3 / Math.SQRT2));
    for (const x of hand.each) expect(x).toBeLessThan(0.2 * mc.max);
    expect(corners.max).toBeLessThan(0.2 * mc.max);
    // |H| ≤ 1 for this divider: no more than the square's AC RMS up to n = 15.
    let bound = 0;
    for (let n = 1; n <= 15; n += 2) bound += (2 / (n * Math.PI)) ** 2 / 2;
    expect(mc.max).toBeLessThanOrEqual(Math.sqrt(bound));
    // And the worst board's resonance is at the third harmonic.
    const fr = 1 / (2 * Math.PI * Math.sqrt(mc.maxValues[0] * mc.maxValues[1]));
    expect(Math.abs(fr / 3000 - 1)).toBeLessThan(0.01);
    console.log(`interior worst case: corners max ${corners.max} V rms, Monte Carlo (1000) max ${mc.max} V rms at ${fr} Hz`);
  });
});

describe('spread: errors', () => {
  it('an unknown measure lists the allowed ones', () => {
    const e = failure(() => spread(sw, hart, 'ripple'));
    expect(e.code).toBe('VALUE');
    for (const m of MEASURES) expect(e.message).toContain(m);
    expect(MEASURES).toEqual(['mean', 'rms', 'acrms', 'peak', 'valley', 'pp', 'crest', 'thd']);
    expect(spread(sw, hart, ' PP ').nominal).toBe(spread(sw, hart, 'pp').nominal);
  });

  it('refuses more than LIMITS.corners corners, naming the count and suggesting trials', () => {
    const rows: unknown[][] = [];
    for (let k = 0; k < 17; k++) rows.push(['series', 'R', 1, 1]);
    rows.push(['shunt', 'R', 10, 1]);
    const t = parseLadder(rows);
    const src = makeSpectrum(50, 1);
    src.re[1] = 1;
    const e = failure(() => spread(src, t, 'rms'));
    expect(e.code).toBe('NUM');
    expect(e.message).toMatch(/18 parts/);
    expect(e.message).toContain(String(LIMITS.corners));
    expect(e.message).toMatch(/trials/);
    const mc = spread(src, t, 'rms', { trials: 50 });
    expect(mc.min).toBeLessThan(mc.max);
    expect(e.message).toMatch(/16 toleranced parts/);
    // Below the limit the corners run (2^10 here; 2^16 takes long under jest's sandbox, not in use).
    const t10 = parseLadder([...rows.slice(0, 9), ['shunt', 'R', 10, 1]]);
    expect(spread(src, t10, 'mean').cases).toBe(1024);
  });

  it('rejects bad trials', () => {
    for (const bad of [-1, 2.5, LIMITS.trials + 1]) {
      const e = failure(() => spread(sw, hart, 'rms', { trials: bad }));
      expect(e.code).toBe('NUM');
      expect(e.message).toMatch(/trials must be a whole number from 1 to/);
    }
    expect(failure(() => spread(sw, hart, 'rms', { trials: NaN })).code).toBe('VALUE');
    expect(failure(() => spread(sw, hart, 'rms', { trials: '9' as unknown as number })).code).toBe('VALUE');
    expect(spread(sw, hart, 'rms', { trials: 0 }).method).toBe('corners');
  });

  it('passes on response errors, naming the corner where the network is unbounded', () => {
    expect(failure(() => spread(sw, hart, 'rms', { element: 7 })).code).toBe('NA');
    const w = 2 * Math.PI * 1000;
    // A loss-free series L–C straight across the source resonates at 1 kHz exactly at its −10 %/−10 % corner.
    const t = parseLadder([['shunt', 'L', 1e-3 / 0.9, 10, 'L1'], ['+', 'C', 1 / (w * w * 1e-3) / 0.9, 10, 'C1'], ['shunt', 'R', 10]]);
    const src = makeSpectrum(1000, 1);
    src.re[1] = 1;
    const e = failure(() => spread(src, t, 'rms', { quantity: 'I' }));
    expect(e.code).toBe('NUM');
    expect(e.message).toMatch(/^At the tolerance corner L1 \(row 1\) \u221210 %, C1 \(row 2\) \u221210 %: the ladder is a short circuit/);
    // THD of a response without a fundamental is the measure's own error.
    const dc = makeSpectrum(1000, 2);
    dc.re[0] = 1;
    dc.re[2] = 1;
    expect(failure(() => spread(dc, hart, 'thd')).message).toMatch(/fundamental/);
  });
});
