/**
 * Every argument of every function, one at a time, given a wrong type, a wrong shape or an out-of-range
 * number while the others stay valid: the error kind follows DESIGN §3 (#VALUE! for wrong types and shapes,
 * #NUM! for out-of-range numbers, #N/A for a missing element) and the message names the argument as Excel
 * shows it (its name in the function table). Common practice, no source.
 */
import { invoke } from '../src/functions/invoke';
import { FUNCTIONS, FUNCTION_BY_NAME } from '../src/functions/table';

const LADDER = [['Role', 'Kind', 'Value', 'Tol %', 'Name'], ['series', 'L', '10u', 20, 'L1'], ['+', 'R', 0.05, null, 'DCR'], ['shunt', 'C', '22u', 10, 'C1'], ['shunt', 'R', 5, null, 'RL']];
const spectrum = (invoke(FUNCTION_BY_NAME.get('PULSE')!, [0, 12, 0.4, 100e3, 20, 1e-7, 1e-7]) as { value: unknown }).value;

/** A valid call of each function: the baseline whose arguments are spoilt one by one. */
const VALID: Record<string, unknown[]> = {
  PULSE: [0, 12, 0.4, 100e3, 20, 1e-7, 1e-7, 1e-6],
  RAMP: [0, 1, 1000, 20, 0.3],
  RECTIFIED: [325, 50, 20, 'half'],
  PWL: [[[0], [1e-6], [4e-6]], [[0], [2], [0]], 10, 1e-5],
  SAMPLED: [[[0], [1], [0], [-1]], 1000, 2],
  SINE: [1, 50, 30, 0.5],
  COMBINE: [spectrum, spectrum],
  IMPEDANCE: [LADDER, [[1e3], [1e5]], 'rect', [[1e-5], [0.05], [2.2e-5], [5]]],
  TRANSFER: [LADDER, 1e5, 'db', [[1e-5, 0.05, 2.2e-5, 5]]],
  RESPONSE: [spectrum, LADDER, 'I', 'C1', null, 'voltage'],
  MEAN: [spectrum],
  RMS: [spectrum, true],
  PEAK: [spectrum, false],
  VALLEY: [spectrum, false],
  PKPK: [spectrum, true],
  CREST: [spectrum, false],
  THD: [spectrum, 'rms'],
  ATTIME: [spectrum, 1e-6],
  TRACE: [spectrum, 50, 2],
  POWER: [spectrum, spectrum],
  STRESS: [spectrum, LADDER, null, 'voltage'],
  SPREAD: [spectrum, LADDER, 'pp', 'V', 'C1', 20, null, 'voltage'],
  VALUE: ['4k7', 'ohm'],
  PREFERRED: [5.1e-6, 'E12', 'up'],
  ENG: [4700, 'Ω', 3],
};

type Code = 'VALUE' | 'NUM' | 'NA';
/** Spoilt values by argument: [value, expected code]. Kinds supply the common cases; names add their ranges. */
const BY_KIND: Record<string, [unknown, Code][]> = {
  number: [[true, 'VALUE'], [[[1, 2]], 'VALUE'], ['abc', 'VALUE'], [NaN, 'VALUE'], [Infinity, 'NUM'], [-Infinity, 'NUM']],
  integer: [[true, 'VALUE'], [[[1, 2]], 'VALUE'], ['abc', 'VALUE'], [2.5, 'NUM'], [Infinity, 'NUM'], [5e-324, 'NUM']],
  text: [[true, 'VALUE'], ['bogus', 'VALUE'], [[['a', 'b']], 'VALUE']],
  bool: [['maybe', 'VALUE'], [2, 'VALUE'], [[[true, false]], 'VALUE']],
  range: [[true, 'VALUE'], ['abc', 'VALUE'], [[[1, 2], [3, 4]], 'VALUE']],
  any: [],
};
const BY_NAME: Record<string, [unknown, Code][]> = {
  duty: [[1.5, 'NUM'], [-0.1, 'NUM']],
  rise_fraction: [[1.01, 'NUM'], [-1, 'NUM']],
  frequency: [[0, 'NUM'], [-50, 'NUM'], [1e308, 'NUM']], // 0 Hz (DC) is a frequency for IMPEDANCE and TRANSFER: see below
  line_frequency: [[0, 'NUM'], [-50, 'NUM']],
  sample_rate: [[0, 'NUM'], [-1, 'NUM']],
  harmonics: [[-1, 'NUM'], [10001, 'NUM'], [1e308, 'NUM']],
  rise: [[-1e-9, 'NUM'], [1, 'NUM']],
  fall: [[-1e-9, 'NUM'], [1, 'NUM']],
  delay: [[1e308, 'NUM']],
  period: [[-1, 'NUM'], [0, 'NUM'], [1e-9, 'NUM']],
  points: [[1, 'NUM'], [10001, 'NUM']],
  periods: [[0, 'NUM'], [-1, 'NUM'], [1001, 'NUM']],
  time: [[1e308, 'NUM']],
  trials: [[-1, 'NUM'], [10001, 'NUM'], [2.5, 'NUM']],
  digits: [[0, 'NUM'], [16, 'NUM']],
  value: [[-1, 'NUM'], [0, 'NUM']], // PREFERRED only: ENG formats any number
  element: [['nope', 'NA'], [99, 'NA'], [0, 'NA'], [2.5, 'NUM'], [true, 'VALUE'], [[['C1', 'L1']], 'VALUE']],
  text: [[true, 'VALUE'], [[[1, 2]], 'VALUE'], ['4k7k', 'VALUE'], ['1e999', 'NUM'], ['x'.repeat(300), 'NUM']],
  unit: [['parsec', 'VALUE']],
  values: [[[[1, 2, 3]], 'VALUE'], [[[1e-5], [0.05], [2.2e-5], [-5]], 'NUM'], [[[1e-5], [0.05], [2.2e-5], [0]], 'NUM'], [[[1e-5], [0.05], [null], [5]], 'VALUE']],
  times: [[[[0], [2e-6], [1e-6]], 'NUM'], [[[0], ['x'], [1e-6]], 'VALUE']],
  spectrum: [
    [[['n', 'f', 'A', 'ph'], [0, 0, 1, 0], ['n', 'f', 'A', 'ph']], 'VALUE'], // a header row in the wrong place
    [[[1, 50, -1, 0]], 'NUM'], // a negative amplitude
    [[[1, 50, 1, 0], [2, 150, 1, 0]], 'NUM'], // frequencies not n × one fundamental
    [[[1, 0, 1, 0]], 'NUM'], // frequency 0 above DC
    [[[1.5, 50, 1, 0]], 'NUM'],
    [[[0, 0, 1, 0, 'extra']], 'VALUE'],
  ],
  ladder: [
    [[['series', 'Q', 1]], 'VALUE'],
    [[['sideways', 'R', 1]], 'VALUE'],
    [[['+', 'R', 1]], 'VALUE'],
    [[['series', 'R', -1]], 'NUM'],
    [[['series', 'R', 0]], 'NUM'],
    [[['series', 'C', '2 H']], 'VALUE'],
    [[['series', 'R', 1, 150]], 'NUM'],
    [[['series', 'R', true]], 'VALUE'],
    [[['shunt', 'R', 1], ['Role', 'Kind', 'Value']], 'VALUE'], // a header row in the wrong place
  ],
};
/** `values` of PWL and SAMPLED are columns of numbers, not a ladder's values override. */
const VECTOR_VALUES: Record<string, [unknown, Code][]> = {
  PWL: [[[[0], [1]], 'VALUE'], [[[0], [null], [1]], 'VALUE'], [[[0], ['x'], [1]], 'VALUE'], [[[0], [1e308], [-1e308]], 'NUM']],
  SAMPLED: [[[[0], [null], [1], [2]], 'VALUE'], [[[0], ['x'], [1], [2]], 'VALUE'], [[[0], [true], [1], [2]], 'VALUE'], [[[0], [Infinity], [1], [2]], 'NUM']],
};

/** Argument names as messages may spell them (a spectrum argument named after its position in COMBINE). */
const NAME_IN_MESSAGE: Record<string, RegExp> = {
  spectrum: /spectrum/i,
  voltage_spectrum: /voltage_spectrum|voltage spectrum/i,
  current_spectrum: /current_spectrum|current spectrum/i,
  values: /values|times and values/i,
  times: /times/i,
};

const cases: [string, number, string, unknown, Code][] = [];
for (const f of FUNCTIONS) {
  const base = VALID[f.name];
  f.args.forEach((a, i) => {
    if (a.repeating) return;
    const vector = a.name === 'values' && (f.name === 'PWL' || f.name === 'SAMPLED');
    const named = vector ? VECTOR_VALUES[f.name] : BY_NAME[a.name] ?? [];
    for (const [v, code] of [...(BY_KIND[a.kind] ?? []), ...named]) {
      if ((f.name === 'IMPEDANCE' || f.name === 'TRANSFER') && a.name === 'frequency' && v === 0) continue; // DC
      if (f.name === 'SINE' && a.name === 'frequency' && v === 1e308) continue; // one tone at 1e308 Hz is representable
      if (f.name === 'ENG' && (a.name === 'value' || (a.name === 'unit' && typeof v === 'string'))) continue; // any number, any unit text
      cases.push([f.name, i, a.name, v, code]);
    }
  });
}

test('every function has a valid baseline call', () => {
  for (const f of FUNCTIONS) {
    const r = invoke(f, VALID[f.name]);
    expect({ name: f.name, ok: r.ok, message: r.ok ? '' : r.message }).toEqual({ name: f.name, ok: true, message: '' });
  }
});

const show = (v: unknown): string => {
  const t = typeof v === 'number' ? String(v) : JSON.stringify(v);
  return t.length > 40 ? `${t.slice(0, 37)}...` : t;
};

test.each(cases.map(([fn, i, name, v, code]) => [`${fn} ${name} = ${show(v)}`, fn, i, name, v, code] as const))(
  '%s',
  (_label, fn, i, name, v, code) => {
    const args = [...VALID[fn]];
    args[i] = v;
    const r = invoke(FUNCTION_BY_NAME.get(fn)!, args);
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect({ code: r.code, message: r.message }).toEqual({ code, message: expect.stringMatching(NAME_IN_MESSAGE[name] ?? new RegExp(`\\b${name}\\b`, 'i')) });
  },
);
