import { add, complex, Complex, divide, lusolve, multiply, subtract } from 'mathjs';
import { ACROSS, C, LadderTable, parseLadder, PLUS, SHUNT } from '../src/core/ladder';
import { LIMITS } from '../src/core/limits';
import {
  I_UNBOUNDED, impedance, LadderSolver, makeSolution, Solution, SourceKind, transfer, V_UNBOUNDED,
} from '../src/core/network';
import { failure } from './support/failure';
import { rng } from './support/rng';

const TWO_PI = 2 * Math.PI;
const F = (...f: number[]) => Float64Array.from(f);
const mag = (re: number, im: number) => Math.hypot(re, im);
const deg = (re: number, im: number) => (Math.atan2(im, re) * 180) / Math.PI;


function solveAt(table: LadderTable, f: number, source: SourceKind = 'voltage', fast = true): Solution {
  const s = new LadderSolver(table);
  s.fast = fast;
  const out = makeSolution(table);
  s.solve(f, source, out);
  return out;
}


describe('textbook networks (common practice, no source)', () => {
  it('RC low-pass: |H| = 1/√(1+(ωRC)²), phase −atan(ωRC), −3 dB at 1/(2πRC)', () => {
    const R = 4700, Cv = 33e-9;
    const t = parseLadder([['series', 'R', R], ['shunt', 'C', Cv]]);
    const fc = 1 / (TWO_PI * R * Cv);
    const fs = F(0, 1, 100, fc, 10 * fc, 1e6, 1e9);
    const h = transfer(t, fs);
    fs.forEach((f, i) => {
      const x = TWO_PI * f * R * Cv;
      expect(mag(h.re[i], h.im[i])).toBeCloseTo(1 / Math.sqrt(1 + x * x), 14);
      expect(deg(h.re[i], h.im[i])).toBeCloseTo((-Math.atan(x) * 180) / Math.PI, 11);
    });
    expect(h.re[0]).toBe(1);
    expect(h.im[0]).toBe(0);
    expect(mag(h.re[3], h.im[3])).toBeCloseTo(Math.SQRT1_2, 14);
  });

  it('RL low-pass and high-pass', () => {
    const R = 10, Lv = 2.2e-3;
    const lp = transfer(parseLadder([['series', 'L', Lv], ['shunt', 'R', R]]), F(0, 50, 723.4, 1e5));
    const hp = transfer(parseLadder([['series', 'R', R], ['shunt', 'L', Lv]]), F(0, 50, 723.4, 1e5));
    [0, 50, 723.4, 1e5].forEach((f, i) => {
      const x = (TWO_PI * f * Lv) / R;
      expect(mag(lp.re[i], lp.im[i])).toBeCloseTo(1 / Math.sqrt(1 + x * x), 14);
      expect(mag(hp.re[i], hp.im[i])).toBeCloseTo(x / Math.sqrt(1 + x * x), 14);
    });
  });

  it('series RLC: |Z| = R at f0 = 1/(2π√LC), √2·R at the half-power points, f2 − f1 = f0/Q', () => {
    const R = 5, Lv = 10e-3, Cv = 220e-9;
    const t = parseLadder([['series', 'R', R], ['+', 'L', Lv], ['+', 'C', Cv], ['shunt', 'R', 1e300]]);
    const w0 = 1 / Math.sqrt(Lv * Cv), Q = Math.sqrt(Lv / Cv) / R;
    const a = R / (2 * Lv);
    const w1 = -a + Math.sqrt(a * a + w0 * w0), w2 = a + Math.sqrt(a * a + w0 * w0);
    const z = impedance(t, F(w0 / TWO_PI, w1 / TWO_PI, w2 / TWO_PI));
    expect(mag(z.re[0], z.im[0]) - 1e300).toBeLessThan(1e300); // the load only closes the loop
    const series = impedance(parseLadder([['shunt', 'R', R], ['+', 'L', Lv], ['+', 'C', Cv]]), F(w0 / TWO_PI, w1 / TWO_PI, w2 / TWO_PI));
    expect(series.re[0]).toBeCloseTo(R, 12);
    expect(Math.abs(series.im[0])).toBeLessThan(1e-9 * R);
    expect(mag(series.re[1], series.im[1]) / R).toBeCloseTo(Math.SQRT2, 9);
    expect(mag(series.re[2], series.im[2]) / R).toBeCloseTo(Math.SQRT2, 9);
    expect((w2 - w1) / w0).toBeCloseTo(1 / Q, 14);
    // resonance: the voltage across the capacitor is Q times the source
    const atC = solveAt(parseLadder([['shunt', 'R', R], ['+', 'L', Lv], ['+', 'C', Cv]]), w0 / TWO_PI);
    expect(mag(atC.vRe[2], atC.vIm[2])).toBeCloseTo(Q, 9);
  });

  it('damped LC low-pass with capacitor ESR: |H(f0)| = √(1 + Q²), Q = √(L/C)/ESR', () => {
    const Lv = 47e-6, Cv = 10e-6, esr = 0.02;
    const t = parseLadder([['series', 'L', Lv], ['shunt', 'C', Cv], ['+', 'R', esr]]);
    const f0 = 1 / (TWO_PI * Math.sqrt(Lv * Cv));
    const Q = Math.sqrt(Lv / Cv) / esr;
    const h = transfer(t, F(f0, 100 * f0));
    expect(mag(h.re[0], h.im[0]) / Math.sqrt(1 + Q * Q)).toBeCloseTo(1, 10);
    // far above f0 the ESR zero takes over: H → ESR/(jωL)
    const w = TWO_PI * 100 * f0;
    expect(mag(h.re[1], h.im[1])).toBeCloseTo(mag(esr, -1 / (w * Cv)) / mag(esr, w * Lv - 1 / (w * Cv)), 12);
  });

  it('word forms build the same network as the symbols', () => {
    const a = parseLadder([['series', 'L', 1e-3], ['||', 'R', 50], ['shunt', 'C', 1e-6], ['+', 'R', 0.1], ['shunt', 'R', 8]]);
    const b = parseLadder([
      ['in series', 'inductor', '1 mH'], ['across', 'resistor', 50], ['to ground', 'capacitor', '1u'],
      ['in series with', 'resistor', '100m'], ['shunt branch', 'R', '8R'],
    ]);
    const fs = F(0, 60, 1e3, 2e4);
    expect(transfer(b, fs)).toEqual(transfer(a, fs));
    expect(impedance(b, fs)).toEqual(impedance(a, fs));
  });

  it('a + after || adds in series with the whole parallel combination (left fold)', () => {
    // shunt R1 || R2 + R3 = (R1 ∥ R2) + R3
    const z = impedance(parseLadder([['shunt', 'R', 30], ['||', 'R', 60], ['+', 'R', 5]]), F(1e3));
    expect(z.re[0]).toBeCloseTo(25, 12);
    const z2 = impedance(parseLadder([['shunt', 'R', 30], ['+', 'R', 30], ['||', 'R', 60]]), F(1e3));
    expect(z2.re[0]).toBeCloseTo(30, 12);
  });
});

// DC and resonance cases: circuit analysis by hand (common practice, no source).
describe('DC: inductors short, capacitors open, limits f → 0+ where that is not enough', () => {
  it('an inductor is a short and a capacitor an open', () => {
    expect(transfer(parseLadder([['series', 'L', 1e-3], ['shunt', 'R', 10]]), F(0)).re[0]).toBe(1);
    expect(transfer(parseLadder([['series', 'R', 10], ['shunt', 'L', 1e-3]]), F(0)).re[0]).toBe(0);
    expect(impedance(parseLadder([['series', 'R', 10], ['shunt', 'L', 1e-3]]), F(0)).re[0]).toBe(10);
    expect(impedance(parseLadder([['series', 'R', 10], ['shunt', 'L', 1e-3], ['+', 'R', 2]]), F(0)).re[0]).toBeCloseTo(10 + 2, 14);
  });

  it('a ladder whose DC paths to ground are all capacitors is an open circuit at DC', () => {
    const f = failure(() => impedance(parseLadder([['series', 'R', 10], ['shunt', 'C', 1e-6]]), F(50, 0)));
    expect(f.code).toBe('NUM');
    expect(f.message).toMatch(/open circuit at DC.*capacitors/);
  });

  it('a series capacitor into an open end passes the source voltage: H = 1 at DC and everywhere', () => {
    const t = parseLadder([['series', 'C', 1e-6]]);
    const h = transfer(t, F(0, 1, 1e6));
    expect(Array.from(h.re)).toEqual([1, 1, 1]);
    expect(Array.from(h.im)).toEqual([0, 0, 0]);
    const s = solveAt(t, 0);
    expect([s.vRe[0], s.iRe[0], s.port[0]]).toEqual([0, 0, 0]);
  });

  it('a node held only by capacitors takes the capacitive divider ratio C1/(C1+C2)', () => {
    const h = transfer(parseLadder([['series', 'C', 1e-6], ['shunt', 'C', 3e-6]]), F(0, 1e3));
    expect(h.re[0]).toBeCloseTo(0.25, 15);
    expect(h.re[1]).toBeCloseTo(0.25, 15); // the same at every frequency
    // with a resistor to ground the node is no longer floating
    expect(transfer(parseLadder([['series', 'C', 1e-6], ['shunt', 'C', 3e-6], ['||', 'R', 1e3]]), F(0)).re[0]).toBe(0);
  });

  it('two capacitors in series share the DC voltage inversely to C', () => {
    const s = solveAt(parseLadder([['series', 'C', 1e-6], ['+', 'C', 4e-6], ['shunt', 'R', 100]]), 0);
    expect(s.vRe[0]).toBeCloseTo(0.8, 15);
    expect(s.vRe[1]).toBeCloseTo(0.2, 15);
    expect([s.vRe[2], s.iRe[0], s.iRe[1], s.iRe[2]]).toEqual([0, 0, 0, 0]);
  });

  it('two ideal inductors in parallel share the DC current inversely to L', () => {
    for (const fast of [true, false]) {
      const s = solveAt(parseLadder([['series', 'R', 10], ['shunt', 'L', 1e-3], ['||', 'L', 3e-3]]), 0, 'voltage', fast);
      expect(s.iRe[0]).toBeCloseTo(0.1, 15);
      expect(s.iRe[1]).toBeCloseTo(0.075, 15);
      expect(s.iRe[2]).toBeCloseTo(0.025, 15);
      expect([s.vRe[1], s.vRe[2], s.port[2]]).toEqual([0, 0, 0]);
      expect(s.port[0]).toBeCloseTo(0.1, 15);
    }
  });

  it('a current source into a shunt inductor: all current in L, no voltage; into C ∥ R: V = R', () => {
    const a = solveAt(parseLadder([['shunt', 'L', 1e-3], ['shunt', 'R', 5]]), 0, 'current');
    expect([a.iRe[0], a.iRe[1], a.port[0], a.port[2]]).toEqual([1, 0, 0, 0]);
    const b = solveAt(parseLadder([['shunt', 'C', 1e-3], ['||', 'R', 5]]), 0, 'current');
    expect([b.port[0], b.iRe[0], b.iRe[1]]).toEqual([5, 0, 1]);
  });

  it('a DC-shorted voltage source or DC-open current source is flagged, not divided by zero', () => {
    const a = solveAt(parseLadder([['shunt', 'L', 1e-3]]), 0);
    expect(a.portBad[0]).toBe(1);
    expect(a.bad[0] & I_UNBOUNDED).toBeTruthy();
    expect(a.port[2]).toBe(1); // the far end is still the source node
    const b = solveAt(parseLadder([['series', 'R', 1], ['shunt', 'C', 1e-6]]), 0, 'current');
    expect(b.portBad[0]).toBe(1);
    expect(b.bad[1] & V_UNBOUNDED).toBeTruthy();
    expect(b.iRe[1]).toBe(1); // the capacitor still carries the source's 1 A: only its voltage is unbounded
    expect(b.bad[1] & I_UNBOUNDED).toBe(0);
  });
});

describe('loss-free resonance landing exactly on a frequency', () => {
  const Lv = 1e-3, Cv = 1e-6;
  const f0 = 1 / (TWO_PI * Math.sqrt(Lv * Cv));

  it('a shunt series-LC is an exact short: H = 0, Z = R, the full current flows in L and C', () => {
    const t = parseLadder([['series', 'R', 10], ['shunt', 'L', Lv], ['+', 'C', Cv]]);
    expect(Array.from(transfer(t, F(f0)).re)).toEqual([0]);
    const z = impedance(t, F(f0));
    expect([z.re[0], z.im[0]]).toEqual([10, 0]);
    for (const fast of [true, false]) {
      const s = solveAt(t, f0, 'voltage', fast);
      expect(s.iRe[1]).toBeCloseTo(0.1, 15);
      expect(s.iRe[2]).toBeCloseTo(0.1, 15);
      expect(s.vIm[1]).toBeCloseTo((TWO_PI * f0 * Lv) / 10, 12);
      expect(s.vIm[1] + s.vIm[2]).toBeCloseTo(0, 12);
      expect(Array.from(s.bad)).toEqual([0, 0, 0]);
    }
  });

  it('the same short directly across a voltage source: source current unbounded, far end 0', () => {
    const t = parseLadder([['shunt', 'L', Lv], ['+', 'C', Cv]]);
    expect(Array.from(impedance(t, F(f0)).re)).toEqual([0]);
    const s = solveAt(t, f0);
    expect(s.portBad[0]).toBe(1);
    expect(s.portBad[1]).toBe(0);
    // L and C each carry an unbounded current and so an unbounded voltage (their sum stays 1 V)
    expect(s.bad[0]).toBe(I_UNBOUNDED | V_UNBOUNDED);
    expect(s.bad[1]).toBe(I_UNBOUNDED | V_UNBOUNDED);
  });

  it('a series parallel-LC trap is an exact open: no current beyond it, circulating current inside', () => {
    const t = parseLadder([['series', 'L', Lv], ['||', 'C', Cv], ['shunt', 'R', 50]]);
    expect(Array.from(transfer(t, F(f0)).re)).toEqual([0]);
    const s = solveAt(t, f0);
    expect([s.port[0], s.port[1], s.vRe[2], s.iRe[2]]).toEqual([0, 0, 0, 0]);
    expect(s.vRe[0]).toBeCloseTo(1, 15);
    expect(s.vRe[1]).toBeCloseTo(1, 15);
    const circulating = 1 / (TWO_PI * f0 * Lv);
    expect(s.iIm[0]).toBeCloseTo(-circulating, 12);
    expect(s.iIm[1]).toBeCloseTo(circulating, 12);
    // into an open end the trap passes the source voltage
    expect(Array.from(transfer(parseLadder([['series', 'L', Lv], ['||', 'C', Cv]]), F(f0)).re)).toEqual([1]);
  });

  it('two identical traps in series share the voltage equally (limit f → f0)', () => {
    const t = parseLadder([['series', 'L', Lv], ['||', 'C', Cv], ['series', 'L', Lv], ['||', 'C', Cv], ['shunt', 'R', 50]]);
    const s = solveAt(t, f0);
    expect(s.vRe[0]).toBeCloseTo(0.5, 14);
    expect(s.vRe[2]).toBeCloseTo(0.5, 14);
    expect(s.port[2]).toBe(0);
  });

  it('unequal traps tuned alike share the voltage by their residues: V1/V2 = C2/C1 (from memory: Z ≈ 1/(2jCδω))', () => {
    const t = parseLadder([['series', 'L', Lv], ['||', 'C', Cv], ['series', 'L', Lv / 4], ['||', 'C', 4 * Cv], ['shunt', 'R', 50]]);
    const s = solveAt(t, f0);
    expect(s.vRe[0]).toBeCloseTo(0.8, 13);
    expect(s.vRe[2]).toBeCloseTo(0.2, 13);
  });

  it('two series-resonant shunts on one node split the current inversely to dZ/dω', () => {
    // A = (L1 ∥ C1) + C3 and B = L + C, both shorts at ω0 = 1/√(LC) = √1e9 rad/s (values chosen so).
    // dZ_A/dω = j[L1(1 + ω²L1C1)/(1 − ω²L1C1)² + 1/(ω²C3)] = 8 mΩs, dZ_B/dω = j[L + 1/(ω²C)] = 2 mΩs,
    // so A carries 2/10 and B 8/10 of the 0.1 A through the 10 Ω feed (common practice, no source).
    const t = parseLadder([
      ['series', 'R', 10],
      ['shunt', 'L', 1e-3], ['||', 'C', 0.5e-6], ['+', 'C', 0.5e-6],
      ['shunt', 'L', Lv], ['+', 'C', Cv],
    ]);
    for (const fast of [true, false]) {
      const s = solveAt(t, f0, 'voltage', fast);
      expect(s.iRe[0]).toBeCloseTo(0.1, 14);
      expect(s.iRe[3]).toBeCloseTo(0.02, 14); // C3 carries branch A's current
      expect(s.iRe[1]).toBeCloseTo(0.04, 14); // L1 and C1 circulate inside A
      expect(s.iRe[2]).toBeCloseTo(-0.02, 14);
      expect(s.iRe[4]).toBeCloseTo(0.08, 14);
      expect(s.iRe[5]).toBeCloseTo(0.08, 14);
      expect([s.port[2], s.port[3]]).toEqual([0, 0]);
    }
  });

  it('a parallel LC across a current source is an open circuit: impedance and voltage are unbounded', () => {
    const t = parseLadder([['shunt', 'L', Lv], ['||', 'C', Cv]]);
    const f = failure(() => impedance(t, F(1e3, f0)));
    expect(f.code).toBe('NUM');
    expect(f.message).toMatch(/open circuit at 5\.03292 kHz.*loss-free parallel resonance/);
    const s = solveAt(t, f0, 'current');
    expect(s.portBad[0]).toBe(1);
    expect(s.bad[0] & V_UNBOUNDED).toBeTruthy();
  });

  it('an unbounded far-end voltage makes transfer() throw NUM naming the frequency', () => {
    // L-C low-pass without losses, exactly at resonance: H = 1/(1 − ω²LC) is unbounded
    const f = failure(() => transfer(parseLadder([['series', 'L', Lv], ['shunt', 'C', Cv]]), F(f0)));
    expect(f.code).toBe('NUM');
    expect(f.message).toMatch(/unbounded at 5\.03292 kHz/);
  });

  it('a detuning far above rounding is not snapped: |H| follows 1/|1 − ω²LC|', () => {
    const t = parseLadder([['series', 'L', Lv], ['shunt', 'C', Cv]]);
    const f = f0 * (1 + 1e-9);
    const h = transfer(t, F(f));
    const x = 1 - (TWO_PI * f) ** 2 * Lv * Cv;
    expect(mag(h.re[0], h.im[0]) * Math.abs(x)).toBeCloseTo(1, 6);
  });
});

describe('ranges and errors', () => {
  it('pF-to-kH spreads stay accurate from 1 mHz to 1 GHz', () => {
    const Lv = 1e3, Cv = 1e-12, Rv = 1e6;
    const t = parseLadder([['series', 'L', Lv], ['shunt', 'C', Cv], ['||', 'R', Rv]]);
    const fs = F(1e-3, 1, 159.15, 1e3, 1e6, 1e9);
    const h = transfer(t, fs);
    fs.forEach((f, i) => {
      // H = 1 / (1 + Z_L·Y_p), Y_p = jωC + 1/R, evaluated by hand
      const w = TWO_PI * f;
      const ar = 1 - w * Lv * w * Cv, ai = (w * Lv) / Rv;
      const den = ar * ar + ai * ai;
      const er = ar / den, ei = -ai / den;
      expect(Math.abs(h.re[i] - er) + Math.abs(h.im[i] - ei)).toBeLessThan(1e-12 * mag(er, ei));
    });
  });

  it('results beyond the double range are NUM errors, never Infinity or NaN', () => {
    const f = failure(() => impedance(parseLadder([['shunt', 'L', 1e300]]), F(1e10)));
    expect(f.code).toBe('NUM');
    expect(f.message).toMatch(/floating-point range/);
  });

  it('a long ladder attenuating far below the double range gives finite numbers (0), not NaN', () => {
    const rows = [];
    for (let i = 0; i < 100; i++) rows.push(['series', 'R', 1e6], ['shunt', 'C', 1e-3]);
    const h = transfer(parseLadder(rows), F(1, 1e6));
    expect(Number.isFinite(h.re[0]) && Number.isFinite(h.im[0]) && Number.isFinite(h.re[1])).toBe(true);
    expect(mag(h.re[1], h.im[1])).toBeLessThan(1e-300);
  });

  it('checks frequencies and the values override', () => {
    const t = parseLadder([['series', 'R', 1], ['shunt', 'R', 1]]);
    expect(failure(() => transfer(t, F())).code).toBe('VALUE');
    expect(failure(() => transfer(t, F(-1))).code).toBe('NUM');
    expect(failure(() => transfer(t, F(Infinity))).code).toBe('NUM');
    expect(failure(() => transfer(t, F(NaN))).code).toBe('VALUE');
    expect(failure(() => transfer(t, new Float64Array(LIMITS.sweep + 1))).message).toMatch(String(LIMITS.sweep));
    expect(transfer(t, F(0), F(1, 3)).re[0]).toBeCloseTo(0.75, 15);
    expect(failure(() => transfer(t, F(0), F(1))).code).toBe('VALUE');
    expect(failure(() => impedance(t, F(0), F(1, 0))).code).toBe('NUM');
  });

  it('a ladder with no shunt has no impedance; its far end follows the source', () => {
    const t = parseLadder([['series', 'R', 1], ['series', 'L', 1e-3]]);
    const f = failure(() => impedance(t, F(1)));
    expect(f.code).toBe('NUM');
    expect(f.message).toMatch(/nothing connects it to ground/);
    expect(Array.from(transfer(t, F(0, 1)).re)).toEqual([1, 1]);
    expect(solveAt(t, 1, 'current').portBad[0]).toBe(1);
  });

  it('elements after the last shunt carry no current and drop no voltage', () => {
    const s = solveAt(parseLadder([['series', 'R', 1], ['shunt', 'R', 3], ['series', 'L', 1], ['+', 'C', 1e-6]]), 50);
    expect(s.port[2]).toBeCloseTo(0.75, 15);
    expect([s.vRe[2], s.iRe[2], s.vRe[3], s.iRe[3], s.bad[3]]).toEqual([0, 0, 0, 0, 0]);
  });
});

// ---- independent reference: modified nodal analysis with mathjs complex numbers ----

interface Edge {
  row: number;
  from: number;
  to: number;
}

/** Nodes and element edges of a ladder; a `+` row opens an internal node between the composite and itself. */
function topology(t: LadderTable): { edges: Edge[]; nodes: number; far: number } {
  const edges: Edge[] = [];
  let nodes = 2; // 0 = ground, 1 = source node
  let node = 1;
  const build = (first: number, last: number, a: number, b: number): void => {
    if (last === first) edges.push({ row: first, from: a, to: b });
    else if (t.role[last] === PLUS) {
      const m = nodes++;
      build(first, last - 1, a, m);
      edges.push({ row: last, from: m, to: b });
    } else {
      expect(t.role[last]).toBe(ACROSS);
      build(first, last - 1, a, b);
      edges.push({ row: last, from: a, to: b });
    }
  };
  for (let b = 0; b < t.branches; b++) {
    const first = t.branchStart[b], last = t.branchStart[b + 1] - 1;
    if (t.role[first] === SHUNT) build(first, last, node, 0);
    else {
      const next = nodes++;
      build(first, last, node, next);
      node = next;
    }
  }
  return { edges, nodes, far: node };
}

function mnaSolve(t: LadderTable, f: number, source: SourceKind) {
  const { edges, nodes, far } = topology(t);
  const w = TWO_PI * f;
  const z = (row: number): Complex => {
    const v = t.value[row];
    return t.kind[row] === C ? complex(0, -1 / (w * v)) : t.kind[row] === 1 ? complex(0, w * v) : complex(v, 0);
  };
  // unknowns: node voltages 1..nodes-1 (voltage source: node 1 is fixed at 1 V and drops out)
  const first = source === 'voltage' ? 2 : 1;
  const n = nodes - first;
  const Y: Complex[][] = Array.from({ length: n }, () => Array.from({ length: n }, () => complex(0, 0)));
  const rhs: Complex[][] = Array.from({ length: n }, () => [complex(0, 0)]);
  if (source === 'current') rhs[0][0] = complex(1, 0);
  for (const e of edges) {
    const y = divide(1, z(e.row)) as Complex;
    for (const [p, q] of [[e.from, e.to], [e.to, e.from]]) {
      if (p < first) continue;
      Y[p - first][p - first] = add(Y[p - first][p - first], y) as Complex;
      if (q >= first) Y[p - first][q - first] = subtract(Y[p - first][q - first], y) as Complex;
      else if (q === 1) rhs[p - first][0] = add(rhs[p - first][0], y) as Complex; // fixed 1 V at node 1
    }
  }
  const x = n === 0 ? [] : (lusolve(Y as never, rhs as never) as unknown as Complex[][]);
  const V = (node: number): Complex => (node === 0 ? complex(0, 0) : node < first ? complex(1, 0) : x[node - first][0]);
  const v: Complex[] = new Array(t.rows), i: Complex[] = new Array(t.rows);
  let src = complex(0, 0);
  for (const e of edges) {
    v[e.row] = subtract(V(e.from), V(e.to)) as Complex;
    i[e.row] = divide(v[e.row], z(e.row)) as Complex;
    if (e.from === 1) src = add(src, i[e.row]) as Complex;
  }
  return { v, i, source: source === 'voltage' ? src : V(1), far: V(far) };
}

/** The impedance the straightforward way: composite by composite, branch by branch, from the far end. */
function straightforwardImpedance(t: LadderTable, f: number): Complex {
  const w = TWO_PI * f;
  const zs: Complex[] = [];
  for (let b = 0; b < t.branches; b++) {
    let acc: Complex | null = null;
    for (let r = t.branchStart[b]; r < t.branchStart[b + 1]; r++) {
      const v = t.value[r];
      const z = t.kind[r] === C ? divide(1, complex(0, w * v)) as Complex : t.kind[r] === 1 ? complex(0, w * v) : complex(v, 0);
      acc = acc === null ? z : t.role[r] === PLUS ? add(acc, z) as Complex : divide(multiply(acc, z), add(acc, z)) as Complex;
    }
    zs.push(acc as Complex);
  }
  let load: Complex | null = null; // null = open
  for (let b = t.branches - 1; b >= 0; b--) {
    const zb = zs[b];
    if (t.role[t.branchStart[b]] === SHUNT) load = load === null ? zb : divide(multiply(zb, load), add(zb, load)) as Complex;
    else if (load !== null) load = add(zb, load) as Complex;
  }
  return load as Complex;
}

/**
 * Values span three decades per kind so that the nodal reference stays well conditioned (its own error grows
 * with the admittance spread); the wide pF-to-kH case is checked against closed forms above.
 */
function randomLadder(next: () => number): LadderTable {
  const rows: unknown[][] = [];
  const count = 1 + Math.floor(next() * 14);
  const logU = (lo: number, hi: number) => 10 ** (lo + (hi - lo) * next());
  for (let r = 0; r < count; r++) {
    const roles = r === 0 ? ['series', 'shunt'] : ['series', 'shunt', '+', '||'];
    const role = roles[Math.floor(next() * roles.length)];
    const k = Math.floor(next() * 3);
    const value = k === 0 ? logU(0, 3) : k === 1 ? logU(-5, -2) : logU(-8, -5);
    rows.push([role, 'RLC'[k], value]);
  }
  if (!rows.some((r) => r[0] === 'shunt')) rows.push(['shunt', 'R', 10 ** (4 * next())]);
  return parseLadder(rows);
}

describe('cross-check against nodal analysis in mathjs on random ladders (common practice, no source)', () => {
  it('every element voltage and current, source and far end, both source kinds, both solver paths', () => {
    const next = rng(20240611);
    let worst = 0;
    for (let trial = 0; trial < 150; trial++) {
      const t = randomLadder(next);
      const f = 10 ** (2 + 3 * next());
      for (const source of ['voltage', 'current'] as SourceKind[]) {
        const ref = mnaSolve(t, f, source);
        for (const fast of [true, false]) {
          const s = solveAt(t, f, source, fast);
          expect(Array.from(s.bad).every((b) => b === 0)).toBe(true);
          const vScale = Math.max(...ref.v.map((c) => mag(c.re, c.im)), mag(ref.far.re, ref.far.im));
          const iScale = Math.max(...ref.i.map((c) => mag(c.re, c.im)));
          const err = (a: number, b: number, c: Complex, scale: number) => mag(a - c.re, b - c.im) / scale;
          for (let r = 0; r < t.rows; r++) {
            worst = Math.max(worst, err(s.vRe[r], s.vIm[r], ref.v[r], vScale), err(s.iRe[r], s.iIm[r], ref.i[r], iScale));
          }
          worst = Math.max(worst, err(s.port[2], s.port[3], ref.far, vScale));
          const srcScale = source === 'voltage' ? iScale : vScale;
          worst = Math.max(worst, err(s.port[0], s.port[1], ref.source, srcScale));
        }
      }
      const z = impedance(t, F(f));
      const zr = straightforwardImpedance(t, f);
      expect(mag(z.re[0] - zr.re, z.im[0] - zr.im)).toBeLessThan(1e-12 * mag(zr.re, zr.im));
      const h = transfer(t, F(f));
      const ref = mnaSolve(t, f, 'voltage');
      expect(mag(h.re[0] - ref.far.re, h.im[0] - ref.far.im)).toBeLessThan(1e-9 * Math.max(1, mag(ref.far.re, ref.far.im)));
    }
    // relative to the largest voltage / current in the ladder; measured 6e-11, mostly the reference's own error
    expect(worst).toBeLessThan(1e-9);
  });

  it('the fast and the general path agree to rounding on ordinary frequencies', () => {
    const next = rng(7);
    for (let trial = 0; trial < 100; trial++) {
      const t = randomLadder(next);
      const f = 10 ** (1 + 5 * next());
      const a = solveAt(t, f, 'voltage', true), b = solveAt(t, f, 'voltage', false);
      for (let r = 0; r < t.rows; r++) {
        const scale = mag(a.vRe[r], a.vIm[r]) + 1e-300;
        expect(mag(a.vRe[r] - b.vRe[r], a.vIm[r] - b.vIm[r])).toBeLessThanOrEqual(1e-13 * scale);
      }
    }
  });
});
