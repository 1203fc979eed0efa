import { findElement, parseLadder, withValues } from '../src/core/ladder';
import { impedance, LadderSolver, makeSolution, transfer } from '../src/core/network';
import { elementResponses, response } from '../src/core/response';
import { makeSpectrum, order, Spectrum, spectrumFromTable } from '../src/core/spectrum';
import { failure } from './support/failure';

const TWO_PI = 2 * Math.PI;


/** A made-up multi-tone source: DC plus harmonics 1..N with assorted phasors. */
function tones(f0: number, N: number, dc = 1): Spectrum {
  const s = makeSpectrum(f0, N);
  s.re[0] = dc;
  for (let n = 1; n <= N; n++) {
    s.re[n] = Math.cos(n * 1.3) / n;
    s.im[n] = Math.sin(n * 0.7) / n;
  }
  return s;
}

const cmul = (ar: number, ai: number, br: number, bi: number) => [ar * br - ai * bi, ar * bi + ai * br];
const cdiv = (ar: number, ai: number, br: number, bi: number) => {
  const d = br * br + bi * bi;
  return [(ar * br + ai * bi) / d, (ai * br - ar * bi) / d];
};
const close = (a: number, b: number, scale: number) => expect(Math.abs(a - b)).toBeLessThanOrEqual(1e-12 * scale);

const buck = parseLadder([
  ['role', 'kind', 'value', 'tol', 'name'],
  ['series', 'L', '22u', 20, 'L1'], ['+', 'R', '15m', 0, 'DCR'],
  ['shunt', 'C', '47u', 20, 'C1'], ['+', 'R', '8m', 0, 'ESR'],
  ['shunt', 'R', 2.5, 1, 'RL'],
]);

describe('response: default quantities (DESIGN §3 HC.RESPONSE)', () => {
  const src = tones(100e3, 40, 5);
  const freqs = Float64Array.from({ length: 41 }, (_, n) => n * 100e3);

  it('V with a voltage source is the far-end voltage: spectrum × transfer', () => {
    const out = response(src, buck);
    const h = transfer(buck, freqs);
    expect(out.f0).toBe(src.f0);
    expect(order(out)).toBe(40);
    for (let n = 0; n <= 40; n++) {
      const [re, im] = cmul(src.re[n], src.im[n], h.re[n], h.im[n]);
      close(out.re[n], re, 5);
      close(out.im[n], im, 5);
    }
    expect(out.im[0]).toBe(0);
    expect(out.re[0]).toBeCloseTo((5 * 2.5) / (2.5 + 0.015), 12); // DC: DCR and the load divide
  });

  it('I with a voltage source is the source current: spectrum / impedance', () => {
    const out = response(src, buck, { quantity: 'I' });
    const z = impedance(buck, freqs);
    for (let n = 0; n <= 40; n++) {
      const [re, im] = cdiv(src.re[n], src.im[n], z.re[n], z.im[n]);
      close(out.re[n], re, 2);
      close(out.im[n], im, 2);
    }
  });

  it('with a current source, V is the far-end voltage (here Z × I) and I is the source spectrum itself', () => {
    const t = parseLadder([['shunt', 'C', 1e-6], ['||', 'R', 100]]);
    const v = response(src, t, { source: 'current' });
    const z = impedance(t, freqs);
    for (let n = 0; n <= 40; n++) {
      const [re, im] = cmul(src.re[n], src.im[n], z.re[n], z.im[n]);
      close(v.re[n], re, 500);
      close(v.im[n], im, 500);
    }
    const i = response(src, t, { source: 'current', quantity: 'I' });
    expect(Array.from(i.re)).toEqual(Array.from(src.re));
    expect(Array.from(i.im)).toEqual(Array.from(src.im));
  });

  it('reads a DESIGN §2 spectrum table end to end', () => {
    // 10 V DC + 2 V at 50 Hz, 30° into an RC low-pass with f_c = 50 Hz: |H| = 1/√2, −45°
    const R = 1000, Cv = 1 / (TWO_PI * 50 * 1000);
    const spec = spectrumFromTable([['n', 'f', 'amplitude', 'phase'], [0, 0, 10, 0], [1, 50, 2, 30]]);
    const out = response(spec, parseLadder([['series', 'R', R], ['shunt', 'C', Cv]]));
    expect(out.re[0]).toBeCloseTo(10, 13);
    expect(Math.hypot(out.re[1], out.im[1])).toBeCloseTo(Math.SQRT2, 12);
    expect((Math.atan2(out.im[1], out.re[1]) * 180) / Math.PI).toBeCloseTo(-15, 10);
  });
});

describe('response: element quantities and sign conventions', () => {
  it('a DC divider: currents flow source → far end and node → ground, voltages are drops (common practice)', () => {
    const t = parseLadder([['series', 'R', 3, 0, 'Ra'], ['shunt', 'R', 1, 0, 'Rb']]);
    const dc = makeSpectrum(50, 0);
    dc.re[0] = 4;
    const at = (q: 'V' | 'I', e: string) => response(dc, t, { quantity: q, element: findElement(t, e) }).re[0];
    expect([at('I', 'Ra'), at('V', 'Ra'), at('I', 'Rb'), at('V', 'Rb')]).toEqual([1, 3, 1, 1]);
    expect(response(dc, t).re[0]).toBe(1);
    expect(response(dc, t, { quantity: 'I' }).re[0]).toBe(1);
    // a negative source reverses everything
    dc.re[0] = -4;
    expect(at('I', 'Ra')).toBe(-1);
  });

  it('Kirchhoff: series current = shunt current + onward current; branch voltage = Σ of its + elements', () => {
    const src = tones(1e3, 25);
    const e = elementResponses(src, buck);
    const s = e.harmonics + 1;
    for (let n = 0; n <= e.harmonics; n++) {
      // L1 and DCR carry one current; C1+ESR and RL share it
      close(e.iRe[0 * s + n], e.iRe[1 * s + n], 1);
      close(e.iRe[0 * s + n], e.iRe[2 * s + n] + e.iRe[4 * s + n], 1);
      close(e.iIm[0 * s + n], e.iIm[2 * s + n] + e.iIm[4 * s + n], 1);
      // C1 and ESR in series drop the load's voltage together, which is the far end
      close(e.vRe[2 * s + n] + e.vRe[3 * s + n], e.vRe[4 * s + n], 1);
      close(e.vIm[4 * s + n], e.far.im[n], 1);
      // source = L1 + DCR + load voltage
      close(e.vRe[0 * s + n] + e.vRe[1 * s + n] + e.vRe[4 * s + n], src.re[n], 1);
      close(e.source.re[n], e.iRe[0 * s + n], 1);
    }
  });

  it('energy balance: mean source power = Σ resistor power, reactive parts average to 0 (Tellegen\'s theorem; common practice, no source)', () => {
    const t = parseLadder([
      ['series', 'R', 2], ['+', 'L', 1e-3], ['||', 'C', 2e-7], ['shunt', 'C', 1e-5], ['+', 'R', 0.3],
      ['series', 'L', 5e-4], ['shunt', 'R', 12], ['||', 'L', 2e-2],
    ]);
    for (const source of ['voltage', 'current'] as const) {
      const src = tones(400, 60, 2);
      const e = elementResponses(src, t, { source });
      const s = e.harmonics + 1;
      const power = (r: number) => {
        let p = e.vRe[r * s] * e.iRe[r * s];
        for (let n = 1; n < s; n++) p += 0.5 * (e.vRe[r * s + n] * e.iRe[r * s + n] + e.vIm[r * s + n] * e.iIm[r * s + n]);
        return p;
      };
      const sv = source === 'voltage' ? src : e.source, si = source === 'voltage' ? e.source : src;
      let ps = sv.re[0] * si.re[0];
      for (let n = 1; n < s; n++) ps += 0.5 * (sv.re[n] * si.re[n] + sv.im[n] * si.im[n]);
      let absorbed = 0;
      for (let r = 0; r < t.rows; r++) {
        if (t.kind[r] === 0) {
          expect(power(r)).toBeGreaterThan(0);
          absorbed += power(r);
        } else expect(Math.abs(power(r))).toBeLessThan(1e-12 * Math.abs(ps));
      }
      expect(absorbed / ps).toBeCloseTo(1, 12);
    }
  });

  it('elementResponses agrees with response for every element and quantity', () => {
    const src = tones(2e3, 12);
    for (const source of ['voltage', 'current'] as const) {
      const e = elementResponses(src, buck, { source });
      const s = e.harmonics + 1;
      for (let r = 0; r < buck.rows; r++) {
        const v = response(src, buck, { quantity: 'V', element: r, source });
        const i = response(src, buck, { quantity: 'I', element: r, source });
        // Element quantities come from the same per-harmonic solve: bit for bit.
        expect(Array.from(e.vRe.subarray(r * s, r * s + s))).toEqual(Array.from(v.re));
        expect(Array.from(e.iIm.subarray(r * s, r * s + s))).toEqual(Array.from(i.im));
      }
      // The far end by the batched cascade, against the forward pass: equal to rounding (batched-network.test.ts).
      const far = response(src, buck, { source });
      const big = Math.max(...Array.from(far.re, (x, n) => Math.hypot(x, far.im[n])));
      e.far.re.forEach((x, n) => expect(Math.abs(x - far.re[n])).toBeLessThanOrEqual(1e-12 * big));
    }
  });

  it('takes a values override like a re-parsed table', () => {
    const src = tones(5e3, 8);
    const values = Float64Array.from([33e-6, 0.02, 100e-6, 0.005, 1.2]);
    const a = response(src, buck, { values, quantity: 'I', element: 2 });
    const b = response(src, withValues(buck, values), { quantity: 'I', element: 2 });
    expect(Array.from(a.re)).toEqual(Array.from(b.re));
    expect(failure(() => response(src, buck, { values: Float64Array.from([1, 2]) })).code).toBe('VALUE');
  });
});

describe('response: singular harmonics', () => {
  it('a current source without DC may drive capacitors; with DC it is an error naming DC', () => {
    const t = parseLadder([['series', 'R', 10], ['shunt', 'C', 1e-6, 0, 'C1']]);
    const src = tones(1e3, 5, 0);
    const v = response(src, t, { source: 'current' });
    expect(v.re[0]).toBe(0);
    expect(Number.isFinite(v.re[3])).toBe(true);
    const f = failure(() => response(tones(1e3, 5, 0.1), t, { source: 'current' }));
    expect(f.code).toBe('NUM');
    expect(f.message).toMatch(/far-end voltage is unbounded at DC \(harmonic 0\) with an ideal current source/);
    const g = failure(() => response(tones(1e3, 5, 0.1), t, { source: 'current', quantity: 'V', element: 0 }));
    expect(g.code).toBe('none'); // the resistor's voltage is 10 × the source current even at DC
    const h = failure(() => elementResponses(tones(1e3, 5, 0.1), t, { source: 'current' }));
    expect(h.message).toMatch(/open circuit at DC \(harmonic 0\) \(only capacitors to ground\)/);
  });

  it('a voltage source across a DC short: the source current is unbounded at DC', () => {
    const t = parseLadder([['shunt', 'L', 1e-3, 0, 'L1'], ['shunt', 'R', 10]]);
    const f = failure(() => response(tones(50, 3), t, { quantity: 'I' }));
    expect(f.code).toBe('NUM');
    expect(f.message).toMatch(/short circuit at DC \(harmonic 0\) \(an inductor path to ground\).*source current is unbounded.*ESR\/DCR/);
    const g = failure(() => response(tones(50, 3), t, { quantity: 'I', element: 0 }));
    expect(g.message).toMatch(/current through L1 \(row 1\) is unbounded at DC/);
    // the load's current and the far end are fine
    expect(response(tones(50, 3), t, { quantity: 'I', element: 1 }).re[0]).toBeCloseTo(0.1, 15);
    expect(response(tones(50, 3, 0), t, { quantity: 'I' }).re[0]).toBe(0);
  });

  it('a loss-free resonance on harmonic 3: a clear NUM error, or no error when that harmonic is absent', () => {
    const Lv = 1e-3, Cv = 1e-6;
    const f3 = 1 / (TWO_PI * Math.sqrt(Lv * Cv));
    const t = parseLadder([['shunt', 'L', Lv], ['+', 'C', Cv], ['shunt', 'R', 5]]);
    const src = tones(f3 / 3, 5);
    const f = failure(() => response(src, t, { quantity: 'I' }));
    expect(f.code).toBe('NUM');
    expect(f.message).toMatch(/short circuit at harmonic 3 \(5\.03292 kHz\) \(loss-free resonance\): the source current is unbounded/);
    src.re[3] = src.im[3] = 0;
    expect(failure(() => response(src, t, { quantity: 'I' })).code).toBe('none');
    // the far-end voltage is the source voltage whatever the shunt does
    expect(response(tones(f3 / 3, 5), t).re[3]).toBe(tones(f3 / 3, 5).re[3]);
  });

  it('a ladder without a shunt cannot take a current source', () => {
    const f = failure(() => response(tones(50, 2), parseLadder([['series', 'R', 1]]), { source: 'current', quantity: 'I' }));
    expect(f.code).toBe('NUM');
    expect(f.message).toMatch(/no path to ground/);
  });
});

describe('response: argument checks', () => {
  const src = tones(50, 2);
  it('rejects bad options', () => {
    expect(failure(() => response(src, buck, { quantity: 'P' as 'V' })).code).toBe('VALUE');
    expect(failure(() => response(src, buck, { source: 'battery' as 'voltage' })).code).toBe('VALUE');
    expect(failure(() => response(src, buck, { element: 5 })).code).toBe('NA');
    expect(failure(() => response(src, buck, { element: 1.5 })).code).toBe('NA');
    expect(failure(() => response(makeSpectrum(0, 3), buck)).code).toBe('NUM');
    expect(failure(() => elementResponses(makeSpectrum(NaN, 3), buck)).code).toBe('NUM');
  });

  it('a DC-only spectrum (f0 = 0, N = 0) is allowed, and the input is not changed', () => {
    const dc = makeSpectrum(0, 0);
    dc.re[0] = 12;
    expect(response(dc, buck).re[0]).toBeCloseTo((12 * 2.5) / 2.515, 12);
    expect(dc.re[0]).toBe(12);
  });

  it('the solver can be reused across values without allocation per call', () => {
    const solver = new LadderSolver(buck);
    const out = makeSolution(buck);
    solver.solve(1e4, 'voltage', out);
    const a = out.port[2];
    solver.setValues(Float64Array.from([22e-6, 0.015, 47e-6, 0.008, 5]));
    solver.solve(1e4, 'voltage', out);
    expect(out.port[2]).not.toBe(a);
    solver.setValues();
    solver.solve(1e4, 'voltage', out);
    expect(out.port[2]).toBe(a);
  });
});
