/**
 * The fast paths of the spectrum tables (core/spectrum.ts) give the same doubles as the plain forms:
 * hypot2 against Math.hypot, and the single-buffer spectrum.
 */
import { hypot2, makeSpectrum, spectrumFromTable, spectrumToTable } from '../src/core/spectrum';
import { pulse } from '../src/core/waveforms';
import { rng } from './support/rng';


describe('hypot2', () => {
  it('equals Math.hypot bit for bit on random pairs over the whole exponent range', () => {
    const rand = rng(11);
    const f64 = new Float64Array(1);
    const u32 = new Uint32Array(f64.buffer);
    const anyDouble = (): number => {
      do {
        u32[0] = (rand() * 2 ** 32) >>> 0;
        u32[1] = (rand() * 2 ** 32) >>> 0;
      } while (!Number.isFinite(f64[0]));
      return f64[0];
    };
    let bad = 0;
    for (let k = 0; k < 200_000; k++) {
      const scale = 10 ** Math.floor(rand() * 40 - 20);
      const pairs: [number, number][] = [
        [(rand() * 2 - 1) * scale, (rand() * 2 - 1) * scale],
        [(rand() * 2 - 1) * scale, (rand() * 2 - 1) * scale * 1e-9],
        [anyDouble(), anyDouble()],
      ];
      for (const [x, y] of pairs) if (!Object.is(hypot2(x, y), Math.hypot(x, y))) bad++;
    }
    expect(bad).toBe(0);
  });

  it('equals Math.hypot on edge cases', () => {
    const edge = [0, -0, 1, -1, 5e-324, -5e-324, 2.2250738585072014e-308, 1.7976931348623157e308, -1.7976931348623157e308, Infinity, -Infinity, NaN, 3, 4, 1e-300, 1e300];
    for (const x of edge) for (const y of edge) expect(Object.is(hypot2(x, y), Math.hypot(x, y))).toBe(true);
  });
});

describe('spectrum tables', () => {
  it('keeps re and im apart in one buffer', () => {
    const s = makeSpectrum(50, 3);
    expect(s.re.length).toBe(4);
    expect(s.im.length).toBe(4);
    s.re[3] = 1;
    expect(s.im[0]).toBe(0);
    s.im[0] = 2;
    expect(s.re[3]).toBe(1);
  });

  it('writes the amplitudes Math.hypot gives and reads back the same phasors as a row-by-row parse', () => {
    const s = pulse(0, 12, 0.3, 250e3, 300, 20e-9, 30e-9, 1e-7);
    const t = spectrumToTable(s);
    for (let n = 1; n < t.length; n++) expect(t[n][2]).toBe(Math.hypot(s.re[n], s.im[n]));
    const back = spectrumFromTable(t);
    for (let n = 1; n < t.length; n++) {
      const rad = (t[n][3] * Math.PI) / 180;
      expect(back.re[n]).toBe(t[n][2] * Math.cos(rad));
      expect(back.im[n]).toBe(t[n][2] * Math.sin(rad));
    }
    expect(back.re[0]).toBe(t[0][2]);
  });
});
