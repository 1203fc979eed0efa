/**
 * Named regression tests for the bugs found while hardening the functions against bad input, extreme values
 * and huge arguments (issue 6), each with the behaviour before the fix in a comment, plus the numeric
 * robustness cases of the issue (resonances on and near a harmonic, floating nodes, no DC path, pF-to-kH
 * ladders, 1e308 and denormal amplitudes) and one check per size bound of src/core/limits.ts.
 * Expected values are closed forms written beside each check (common practice, no source).
 */
import { invoke, CallResult } from '../src/functions/invoke';
import { FUNCTION_BY_NAME } from '../src/functions/table';
import { grouped, LIMITS } from '../src/core/limits';
import { createEngine } from '../src/engine';

function call(name: string, ...args: unknown[]): CallResult {
  const spec = FUNCTION_BY_NAME.get(name);
  if (!spec) throw new Error(`no function ${name}`);
  return invoke(spec, args);
}
function value(name: string, ...args: unknown[]): unknown {
  const r = call(name, ...args);
  if (!r.ok) throw new Error(`HC.${name}: ${r.code} ${r.message}`);
  return r.value;
}
function failure(name: string, ...args: unknown[]): { code: string; message: string } {
  const r = call(name, ...args);
  if (r.ok) throw new Error(`HC.${name} returned ${JSON.stringify(r.value).slice(0, 200)}`);
  return r;
}
const col = (xs: ArrayLike<unknown>): unknown[][] => Array.from(xs, (x) => [x]);
const RC = [['series', 'R', 1], ['shunt', 'C', 1e-6]];
const sineTable = (a: number, f: number) => value('SINE', a, f) as number[][];

describe('huge ranges no longer overflow the call stack', () => {
  // Before: asVector took Math.max(...rows), so any range of more than about 120 000 rows threw
  // "Maximum call stack size exceeded", reported as "HC.SAMPLED could not compute a result".
  test('HC.SAMPLED of LIMITS.samples (131 072) samples', () => {
    const x = Array.from({ length: LIMITS.samples }, (_, k) => Math.cos((2 * Math.PI * 3 * k) / LIMITS.samples));
    const s = value('SAMPLED', col(x), 1e6, 4) as number[][];
    expect(s[3][2]).toBeCloseTo(1, 12); // a cosine at harmonic 3 of unit amplitude
  });

  test('HC.IMPEDANCE of a sweep in a whole column (1 048 576 cells, blanks after the data)', () => {
    const sweep = Array.from({ length: 1 << 20 }, (_, k) => [k < 3 ? 1000 * (k + 1) : null]);
    const z = value('IMPEDANCE', [['series', 'R', 1], ['shunt', 'R', 1]], sweep) as number[][];
    expect(z).toEqual([[2, 0], [2, 0], [2, 0]]);
  });
});

describe('text that names an inherited property is not a known word', () => {
  // Before: tables were plain objects, so "constructor", "toString" … found Object.prototype members.
  test('HC.VALUE("5constructor") was 5', () => {
    expect(failure('VALUE', '5constructor').code).toBe('VALUE');
    expect(failure('VALUE', '2toString').code).toBe('VALUE');
  });

  test('HC.IMPEDANCE(…, "constructor") returned the impedance in dB', () => {
    const e = failure('IMPEDANCE', [['series', 'R', 1], ['shunt', 'R', 1]], 1000, 'constructor');
    expect(e.code).toBe('VALUE');
    expect(e.message).toMatch(/form 'constructor' is not known; use one of polar, rect, complex/);
  });

  test('a ladder role "constructor" is unknown (it was read as a branch start)', () => {
    const e = failure('IMPEDANCE', [['series', 'R', 1], ['constructor', 'R', 1], ['shunt', 'R', 1]], 1000);
    expect(e.message).toMatch(/role "constructor" is not known/);
    expect(failure('IMPEDANCE', [['shunt', 'hasOwnProperty', 1]], 1000).message).toMatch(/kind "hasOwnProperty" is not known/);
  });
});

describe('long texts', () => {
  // Before: the value patterns backtracked quadratically; 30 000 digits and " 1 1" took about one second.
  test('HC.VALUE of a 30 000-character text is refused at once', () => {
    const t0 = Date.now();
    const e = failure('VALUE', `${'1'.repeat(30000)} 1 1`);
    expect(Date.now() - t0).toBeLessThan(200);
    expect(e.code).toBe('NUM');
    expect(e.message).toMatch(/at most 256 characters/);
  });

  test('messages quote a long argument cut short', () => {
    // Before: the whole 20 000-character text was echoed in the message.
    expect(failure('THD', sineTable(1, 50), 'x'.repeat(20000)).message.length).toBeLessThan(200);
    expect(failure('SPREAD', sineTable(1, 50), RC, 'y'.repeat(5000)).message.length).toBeLessThan(300);
    expect(failure('PREFERRED', 1, 'z'.repeat(5000)).message.length).toBeLessThan(200);
  });
});

describe('magnitudes near the ends of the double range', () => {
  test('RMS of amplitudes near 1e308 is finite when the RMS is representable', () => {
    // Before: the power-of-two scale was 2^1024 = Infinity, so this was "RMS is too large to represent".
    const s = [[0, 0, 1e308, 0], [1, 50, 1e308, 0]];
    expect((value('RMS', s) as number) / (1e308 * Math.sqrt(1.5))).toBeCloseTo(1, 14); // √(DC² + A²/2)
  });

  test('THD of denormal amplitudes is the finite ratio', () => {
    // Before: harm/fund overflowed before the scale was applied: "THD … is too large to represent".
    const s = [[0, 0, 0, 0], [1, 50, 5e-324, 0], [2, 100, 1e-320, 0]];
    expect(value('THD', s)).toBe(1e-320 / 5e-324); // both exact multiples of the smallest denormal
  });

  test('PEAK, VALLEY, PKPK and CREST do not depend on the scale of the amplitudes', () => {
    // Before: a ±1 square wave scaled by 2^600 read PEAK 1.18·2^600 (the Gibbs overshoot; the jump model's
    // sums of squares overflowed), and a pulse's VALLEY moved by 4e-3 of its size at 2^±600.
    const square = (k: number) => value('PULSE', -(2 ** k), 2 ** k, 0.5, 1, 200) as number[][];
    for (const k of [-900, -600, 600, 1000]) {
      expect(value('PEAK', square(k))).toBe((value('PEAK', square(0)) as number) * 2 ** k);
      expect(value('VALLEY', square(k))).toBe((value('VALLEY', square(0)) as number) * 2 ** k);
      expect(value('CREST', square(k))).toBeCloseTo(value('CREST', square(0)) as number, 13);
    }
    expect(value('PEAK', square(0))).toBeCloseTo(1, 12);
  });

  test('ATTIME sums that overflow on the way but not at the end', () => {
    // Before: 1e308 + 1e308 overflowed before the −1.5e308 term: "the value is too large to represent".
    const s = [[0, 0, 1e308, 0], [1, 50, 1e308, 0], [2, 100, 1.5e308, 180]];
    expect((value('ATTIME', s, 0) as number) / 0.5e308).toBeCloseTo(1, 14);
  });

  test('POWER halves before it multiplies', () => {
    // Before: 1e308 · 2 overflowed before the factor ½: "the mean power is too large".
    expect(value('POWER', [[1, 50, 1e308, 0]], [[1, 50, 2, 0]])).toBe(1e308);
  });

  test('a constant PWL of 1e308 is fine; a step of 2e308 is a NUM error naming the values', () => {
    // Before: (va + vb)/2 overflowed for the constant as well.
    expect((value('PWL', [[0], [1]], [[1e308], [1e308]], 2) as number[][])[0][2]).toBe(1e308);
    expect(failure('PWL', [[0], [1]], [[1e308], [-1e308]], 2).message).toMatch(/values: the step from point 1 exceeds the number range/);
  });

  test('frequencies, delays and times beyond the double range get messages that name them', () => {
    // Before: the generic "HC.PULSE: the result is not a finite number for these inputs".
    expect(failure('PULSE', 0, 1, 0.5, 1e308, 2).message).toMatch(/harmonic frequencies exceed the number range/);
    // Before: "pulse: the values are too large to represent (coefficient 1 overflows)".
    expect(failure('PULSE', 0, 1, 0.5, 1000, 3, 0, 0, 1e308).message).toMatch(/delay × frequency/);
    // Before: "the value is too large to represent as a number" for a unit sine.
    expect(failure('ATTIME', sineTable(1, 50), 1e308).message).toMatch(/time 1e\+308 s is beyond the number range/);
    // Before: the generic non-finite message (a period of 1/5e-324 s).
    expect(failure('TRACE', [[0, 0, 1, 0], [1, 5e-324, 1, 0]], 5).message).toMatch(/fundamental 5e-324 Hz is too low/);
  });

  test('denormal and 1e308-scale amplitudes keep finite, exact answers', () => {
    expect(value('MEAN', [[0, 0, 5e-324, 0]])).toBe(5e-324);
    expect(value('RMS', [[0, 0, 0, 0], [1, 50, 5e-324, 0]])).toBe(5e-324); // 5e-324/√2 rounds to the smallest denormal
    expect(value('PEAK', [[0, 0, 0, 0], [1, 50, 1e308, 0]])).toBeCloseTo(1e308, -294);
    const amplified = [[0, 0, 0, 0], [1, 50, 1e308, 0]];
    // 1e308 A into 10 Ω would be 1e309 V: a NUM error, never Infinity in a cell.
    const e = failure('RESPONSE', amplified, [['shunt', 'R', 10]], 'V', null, null, 'current');
    expect(e.code).toBe('NUM');
    expect(e.message).toMatch(/exceeds the number range/);
  });
});

describe('blanks inside a column no longer shift what follows', () => {
  test('HC.PWL pairs times and values by position', () => {
    // Before: blanks were dropped from each column separately, so these became the pairs (0,0), (1e-6,1), (2e-6,0).
    const e = failure('PWL', [[0], [null], [1e-6], [2e-6]], [[0], [1], [null], [0]], 5, 3e-6);
    expect(e.code).toBe('VALUE');
    expect(e.message).toMatch(/paired by position: entry 2 of times is blank/);
    // A gap in both columns at the same place, and blanks after the data, are fine.
    const a = value('PWL', [[0], [null], [1e-6], [null]], [[0], [null], [1], [null]], 3, 2e-6);
    expect(a).toEqual(value('PWL', [[0], [1e-6]], [[0], [1]], 3, 2e-6));
  });

  test('HC.IMPEDANCE and HC.TRANSFER refuse a blank inside a sweep (rows would not line up)', () => {
    // Before: the result had one row fewer than the sweep, silently.
    for (const name of ['IMPEDANCE', 'TRANSFER']) {
      const e = failure(name, RC, [[1000], [null], [2000]]);
      expect(e.message).toMatch(/frequency: entry 2 is blank/);
    }
  });

  test('HC.SAMPLED refuses a blank inside the samples', () => {
    expect(failure('SAMPLED', [[1], [2], [''], [4]], 1000, 1).message).toMatch(/values: entry 3 is blank/);
    expect(value('SAMPLED', [[1], [2], [3], [4], [null]], 1000, 1)).toEqual(value('SAMPLED', [[1], [2], [3], [4]], 1000, 1));
  });
});

describe('spectrum tables', () => {
  test('numbers written as text must be plain decimals', () => {
    // Before: "0x10" read as 16 and "1e3" as 1000 alike; now hex and "Infinity" are not numbers.
    expect(value('MEAN', [[0, 0, ' 1e3 ', 0]])).toBe(1000);
    expect(failure('MEAN', [[0, 0, '0x10', 0]]).message).toMatch(/taken for a header/);
    expect(failure('MEAN', [['n', 'f', 'A', 'ph'], [0, 0, 'Infinity', 0]]).code).toBe('VALUE');
  });

  test('the DC row’s phase must be 0 or ±180', () => {
    // Before: a DC phase of 90 was read as +mean, of 135 as −mean.
    expect(value('MEAN', [[0, 0, 2, 180]])).toBe(-2);
    expect(value('MEAN', [[0, 0, 2, -180]])).toBe(-2);
    expect(failure('MEAN', [[0, 0, 2, 90]]).message).toMatch(/DC \(n = 0\) row's phase must be 0/);
  });

  test('a second header row is named as such', () => {
    const e = failure('RMS', [['n', 'f', 'A', 'ph'], [0, 0, 1, 0], ['n', 'f', 'A', 'ph']]);
    expect(e.code).toBe('VALUE');
    expect(e.message).toMatch(/row 3, column 1 must be a number, got "n" \(only one header row, at the top, is skipped\)/);
  });

  test('repeated rows of one harmonic that add up beyond the double range', () => {
    const e = failure('RMS', [[1, 50, 1.7e308, 0], [1, 50, 1.7e308, 0]]);
    expect(e.message).toMatch(/rows for n = 1 add up beyond the number range/);
  });
});

describe('numeric robustness of the ladder solution', () => {
  // Series L then shunt C: far-end voltage / source = 1/(1 − ω²LC), resonance at ω₀ = 1/√(LC).
  const L = 1e-3;
  const C = 1e-6;
  const fr = 1 / (2 * Math.PI * Math.sqrt(L * C));
  const LC = [['series', 'L', L], ['shunt', 'C', C]];

  test('a loss-free resonance exactly on harmonic 3 is a NUM error naming the harmonic', () => {
    const src = value('PULSE', 0, 1, 0.5, fr / 3, 5);
    const e = failure('RESPONSE', src, LC);
    expect(e.code).toBe('NUM');
    expect(e.message).toMatch(/unbounded at harmonic 3 \(5\.03292 kHz\)/);
  });

  test.each([1e-12, -1e-12, 1e-9])('1/(1 − ω²LC) when the resonance is %p relative off harmonic 3', (d) => {
    const f = fr * (1 + d);
    const src = value('PULSE', 0, 1, 0.5, f / 3, 5) as number[][];
    const out = value('RESPONSE', src, LC) as number[][];
    const w = 2 * Math.PI * f;
    const gain = 1 / Math.abs(1 - w * w * L * C); // about 5e11 at 1e-12
    // ω²LC is 1 − 2δ to within 1e-16, so the gain is good to about 1e-16/(2δ).
    expect(Math.abs(out[3][2] / src[3][2] / gain - 1)).toBeLessThan(1e-4);
  });

  test('floating nodes: no path to ground', () => {
    const floating = [['series', 'R', 1], ['series', 'C', 1e-6]];
    expect(failure('IMPEDANCE', floating, 1000).message).toMatch(/nothing connects it to ground/);
    expect(value('RESPONSE', [[0, 0, 1, 0], [1, 50, 1, 0]], floating)).toEqual([[0, 0, 1, 0], [1, 50, 1, 0]]); // no current: far end = source
    expect(failure('RESPONSE', [[0, 0, 1, 0]], floating, 'V', null, null, 'current').message).toMatch(/no path to ground/);
  });

  test('no DC path: a current source into a capacitor', () => {
    const cap = [['shunt', 'C', 1e-6]];
    expect(failure('RESPONSE', [[0, 0, 1, 0], [1, 50, 1, 0]], cap, 'V', null, null, 'current').message).toMatch(/unbounded at DC/);
    const v = value('RESPONSE', [[1, 50, 1, 0]], cap, 'V', null, null, 'current') as number[][];
    expect(v[1][2]).toBeCloseTo(1 / (2 * Math.PI * 50 * 1e-6), 9); // |Z_C| at 50 Hz
  });

  test('pF-to-kH ladders: exact limits at DC and at high frequency', () => {
    const wide = [['series', 'L', '1 kH'], ['+', 'R', '1m'], ['shunt', 'C', '1p'], ['+', 'R', '1k'], ['shunt', 'R', '1e9']];
    const z = value('IMPEDANCE', wide, [[0], [1e15]], 'rect') as number[][];
    expect(z[0][0]).toBeCloseTo(1e9 + 1e-3, 3); // DC: L short, C open
    expect(z[1][1] / (2 * Math.PI * 1e15 * 1e3)).toBeCloseTo(1, 12); // far above: the 1 kH dominates
  });

  test('harmonic 10 000 of 1 GHz through pF and nH parts stays finite', () => {
    const s = value('RESPONSE', [[0, 0, 1, 0], [10000, 1e13, 1, 0]], [['series', 'L', 1e-9], ['shunt', 'C', 1e-12], ['+', 'R', 1]]) as number[][];
    expect(s).toHaveLength(10001);
    expect(s.flat().every(Number.isFinite)).toBe(true);
  });
});

describe('part values and impedances outside the range the solver works in', () => {
  // Before: a non-finite element impedance made every sum "cancel" (rounding-noise snapping with an infinite
  // scale), so the answer was a silent 0; an underflowing product gave 0 as well.
  test('1e306 H at 1 kHz had an impedance of 0 Ω; now a NUM error naming the row and the range', () => {
    const e = failure('IMPEDANCE', [['series', 'L', 1e306, null, 'L1'], ['shunt', 'R', 1]], 1000);
    expect(e.code).toBe('NUM');
    expect(e.message).toMatch(/ladder L1 \(row 1\): the inductance 1\.00e306 H is outside the 1e-60 … 1e60 H/);
  });

  test('two 1e-200 Ω resistors in parallel were 0 Ω', () => {
    expect(failure('IMPEDANCE', [['shunt', 'R', 1e-200], ['||', 'R', 1e-200]], 1).message).toMatch(/resistance 10\.0e-201 Ω is outside/);
  });

  test('10 µH at 3e307 Hz (where 2πf overflows) was 0 Ω', () => {
    const e = failure('IMPEDANCE', [['series', 'L', 1e-5], ['shunt', 'R', 1]], 3e307);
    expect(e.message).toMatch(/10\.0 µH at 30\.0e306 Hz has an impedance of more than 1\.8e308 Ω/);
  });

  test('5e-324 F was reported as coinciding loss-free resonances', () => {
    expect(failure('TRANSFER', [['series', 'R', 1], ['shunt', 'C', 5e-324]], 1000).message).toMatch(/capacitance 4\.94e-324 F is outside/);
  });

  test('the range applies to the values override, the harmonics present and the tolerance band', () => {
    expect(failure('RESPONSE', sineTable(1, 1e-70), RC).message).toMatch(/1\.00 µF at .* has an impedance of .* outside/);
    expect(failure('STRESS', sineTable(1, 50), RC, [[1], [1e-70]]).message).toMatch(/capacitance .* is outside/);
    const wide = [['series', 'R', 1e60, 50], ['shunt', 'R', 1]];
    expect(failure('SPREAD', sineTable(1, 50), wide, 'rms').message).toMatch(/with its tolerance/);
    // DC-only spectra and the harmonics a spectrum leaves at 0 do not count.
    expect(value('RESPONSE', [[0, 0, 1, 0], [3, 150, 0, 0]], RC)).toEqual([[0, 0, 1, 0], [1, 50, 0, 0], [2, 100, 0, 0], [3, 150, 0, 0]]);
  });
});

describe('every size bound is a NUM error that names it', () => {
  // Derived from LIMITS, so that a bound moved after new measurements keeps its test.
  const ladder = (rows: number) => Array.from({ length: rows }, (_, k) => (k % 2 ? ['shunt', 'R', 1] : ['series', 'R', 1]));
  const spectrum = (N: number) => value('RAMP', 0, 1, 1000, N) as number[][];
  const g = (n: number) => grouped(n).replace(/,/g, ',?'); // with or without thousands separators
  const expectBound = (r: { code: string; message: string }, text: string) => {
    expect(r.code).toBe('NUM');
    expect(r.message).toMatch(new RegExp(text));
  };

  test('harmonics, spectrum rows, ladder rows, samples, PWL points', () => {
    expectBound(failure('PULSE', 0, 1, 0.5, 1, LIMITS.harmonics + 1), `at most ${g(LIMITS.harmonics)} harmonics`);
    expectBound(failure('MEAN', Array.from({ length: LIMITS.spectrumRows + 1 }, () => [1, 50, 1, 0])), `at most ${g(LIMITS.spectrumRows)} are allowed`);
    expectBound(failure('IMPEDANCE', ladder(LIMITS.ladderRows + 1), 1000), `at most ${g(LIMITS.ladderRows)} are allowed`);
    expectBound(failure('SAMPLED', col(new Array(LIMITS.samples + 1).fill(1)), 1, 1), `at most ${g(LIMITS.samples)} are allowed`);
    const many = col(Array.from({ length: LIMITS.pwlPoints + 1 }, (_, k) => k));
    expectBound(failure('PWL', many, many, 0), `at most ${g(LIMITS.pwlPoints)} points`);
  });

  test('work bounds: PWL, network, STRESS, SPREAD, COMBINE', () => {
    const t = col(Array.from({ length: 1000 }, (_, k) => k));
    const h = Math.floor(LIMITS.pwlWork / 1000); // 1000 × (h + 1) points-harmonics, just over the bound
    expectBound(failure('PWL', t, t, h), `points × \\(harmonics \\+ 1\\) = ${g(1000 * (h + 1))} .* at most ${g(LIMITS.pwlWork)}`);
    const n = Math.floor(LIMITS.networkWork / LIMITS.ladderRows); // 200 rows × (n + 1)
    expectBound(failure('RESPONSE', spectrum(n), ladder(LIMITS.ladderRows)), `${LIMITS.ladderRows} rows at ${g(n + 1)} harmonics .* at most ${g(LIMITS.networkWork)}`);
    expectBound(failure('IMPEDANCE', ladder(LIMITS.ladderRows), col(new Array(n + 1).fill(1000))), 'Use fewer frequencies or fewer ladder rows');
    const m = Math.floor(LIMITS.stressWork / 15); // 15 rows × (m + 1)
    expectBound(failure('STRESS', spectrum(m), ladder(15)), `at most ${g(LIMITS.stressWork)} .* fewer harmonics, or fewer ladder rows`);
    const k = 10; // 2^10 corners × 30 (20 rows + 10) × (N + 1) over the bound
    const N = Math.ceil(LIMITS.spreadWork / (1025 * 30));
    expectBound(failure('SPREAD', spectrum(N), ladder(20).map((r, j) => (j < k ? [...r, 5] : r)), 'rms'), `1,025 cases .* at most ${g(LIMITS.spreadWork)}`);
    const trials = Math.min(LIMITS.trials, Math.ceil(LIMITS.spreadWork / (11 * 104)));
    expectBound(failure('SPREAD', spectrum(10), ladder(4).map((r) => [...r, 1]), 'pp', null, null, trials), 'fewer trials');
    const big = spectrum(LIMITS.harmonics - 1);
    const count = Math.ceil(LIMITS.combineRows / LIMITS.harmonics) + 1;
    expectBound(failure('COMBINE', ...new Array(count).fill(big)), `more than ${g(LIMITS.combineRows)} harmonic rows`);
  });

  test('sweep, trace, trials, corners, spectra in COMBINE, range cells, text length', () => {
    expectBound(failure('IMPEDANCE', ladder(2), col(new Array(LIMITS.sweep + 1).fill(1))), `at most ${g(LIMITS.sweep)} are allowed`);
    expectBound(failure('TRACE', spectrum(3), LIMITS.tracePoints + 1), `from 2 to ${g(LIMITS.tracePoints)}`);
    expectBound(failure('TRACE', spectrum(3), 100, LIMITS.tracePeriods + 1), `at most ${g(LIMITS.tracePeriods)}`);
    expectBound(failure('SPREAD', spectrum(3), ladder(2).map((r) => [...r, 1]), 'rms', null, null, LIMITS.trials + 1), `from 1 to ${g(LIMITS.trials)}`);
    const parts = Math.log2(LIMITS.corners) + 1;
    expectBound(failure('SPREAD', spectrum(3), ladder(parts).map((r) => [...r, 1]), 'rms'), `at most ${g(LIMITS.corners)}`);
    expectBound(failure('COMBINE', ...new Array(LIMITS.combine + 1).fill(sineTable(1, 50))), `at most ${LIMITS.combine} spectra`);
    const rows = Math.floor(LIMITS.rangeCells / 4) + 1;
    expectBound(failure('RMS', Array.from({ length: rows }, () => [1, 50, 1, 0])), `range of ${g(4 * rows)} cells; at most ${g(LIMITS.rangeCells)}`);
    expectBound(failure('ENG', 1, 'Ω'.repeat(LIMITS.textLength + 1)), `at most ${LIMITS.textLength} are allowed`);
  });
});

describe('an omitted range argument in the headless engine', () => {
  // Before: =HC.RESPONSE(s, ladder, , , , "current") gave #VALUE! "values must hold one value per ladder row:
  // … values has 1", because HyperFormula hands an omitted range argument over as one blank cell.
  it('is omitted, as in Excel', () => {
    const ladder = [['series', 'R', 1], ['shunt', 'R', 1]];
    const hf = createEngine({
      S: [
        ...ladder,
        ['=HC.RMS(HC.RESPONSE(HC.SINE(2, 50), A1:C2, , , , "current"))', '=HC.SPREAD(HC.SINE(2, 50), A1:C2, "rms", , , , , )'],
      ],
    });
    // A 2 A current source into 1 Ω to ground (the series 1 Ω leads to the far end, open): 2 V peak, √2 V rms.
    expect(hf.getCellValue({ sheet: 0, row: 2, col: 0 })).toBeCloseTo(Math.SQRT2, 14);
    expect(typeof hf.getCellValue({ sheet: 0, row: 2, col: 1 })).toBe('number');
  });
});
