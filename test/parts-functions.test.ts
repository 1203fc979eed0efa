import { parseLadder } from '../src/core/ladder';
import { LIMITS } from '../src/core/limits';
import { spectrumFromTable, spectrumToTable } from '../src/core/spectrum';
import { stress } from '../src/core/stress';
import { spread } from '../src/core/tolerance';
import { pulse } from '../src/core/waveforms';
import { invoke } from '../src/functions/invoke';
import { PARTS_FUNCTIONS } from '../src/functions/parts-args';

const STRESS = PARTS_FUNCTIONS.find((f) => f.name === 'STRESS')!;
const SPREAD = PARTS_FUNCTIONS.find((f) => f.name === 'SPREAD')!;

/** The value of a successful call, or a failed expectation naming the error. */
function value(r: ReturnType<typeof invoke>) {
  if (!r.ok) throw new Error(`expected a value, got #${r.code}: ${r.message}`);
  return r.value as (number | string)[][];
}

// Invented demo values: a buck output filter as a sheet range (header row, one part without a name).
const ladderRange = [
  ['Role', 'Kind', 'Value', 'Tol %', 'Name'],
  ['series', 'L', '10u', 20, 'L1'],
  ['+', 'R', '20m', null, 'DCR'],
  ['shunt', 'C', '47u', 10, null],
  ['shunt', 'R', 2.2, '', 'RLOAD'],
];
const ladder = parseLadder(ladderRange);
const spec = pulse(0, 12, 0.42, 300e3, 40);
const specRange = [['n', 'f (Hz)', 'amplitude', 'phase'], ...spectrumToTable(spec)];
/** What the functions read back from the table (amplitude/phase → phasor moves the last bits). */
const specRead = spectrumFromTable(specRange);

describe('HC.STRESS through invoke', () => {
  it('spills one row per ladder row: label, I_rms, I_peak, V_rms, V_peak, power (no header)', () => {
    const rows = value(invoke(STRESS, [specRange, ladderRange, null, null]));
    const core = stress(specRead, ladder);
    expect(rows.length).toBe(4);
    expect(rows.map((r) => r[0])).toEqual(['L1', 'DCR', 'row 3 C', 'RLOAD']);
    rows.forEach((r, i) => {
      expect(r.length).toBe(6);
      expect(r.slice(1)).toEqual([core.iRms[i], core.iPeak[i], core.vRms[i], core.vPeak[i], core.power[i]]);
    });
    // The load takes (almost) all of 12 V × 0.42 ≈ 5 V: P ≈ 5.04²/2.2 W (common practice, no source).
    expect(rows[3][5] as number).toBeCloseTo(((12 * 0.42 * 2.2) / 2.22) ** 2 / 2.2, 2);
  });

  it('takes a values override (a row) and a current source', () => {
    const values = [['22u', '20m', '100u', 4.7]];
    const a = value(invoke(STRESS, [specRange, ladderRange, values, 'voltage']));
    const core = stress(specRead, ladder, { values: [22e-6, 0.02, 100e-6, 4.7] });
    expect(a[0][2]).toBe(core.iPeak[0]);
    const dc = [[0, 0, 0.5, 0]]; // 0.5 A DC pushed in
    const b = value(invoke(STRESS, [dc, ladderRange, null, 'current']));
    expect(b[3][1]).toBeCloseTo(0.5, 14);
    expect(b[3][5]).toBeCloseTo(0.25 * 2.2, 12);
  });

  it('reports bad arguments as errors, never throwing', () => {
    const bad = invoke(STRESS, [[['x', 1, 2, 3]], ladderRange, null, null]);
    expect(bad).toMatchObject({ ok: false, code: 'VALUE' });
    expect(invoke(STRESS, [specRange, null, null, null])).toMatchObject({ ok: false, code: 'VALUE' });
    const src = invoke(STRESS, [specRange, ladderRange, null, 'battery']);
    expect(src).toMatchObject({ ok: false, code: 'VALUE' });
    expect(!src.ok && src.message).toMatch(/voltage, current/);
    const short = invoke(STRESS, [specRange, [['shunt', 'L', '1m']], null, null]);
    expect(short).toMatchObject({ ok: false, code: 'NUM' });
  });
});

describe('HC.SPREAD through invoke', () => {
  it('returns one row [min, nominal, max] equal to the core, corners and Monte Carlo', () => {
    const r = value(invoke(SPREAD, [specRange, ladderRange, 'pp', null, null, null, null, null]));
    const core = spread(specRead, ladder, 'pp');
    expect(r).toEqual([[core.min, core.nominal, core.max]]);
    expect(r[0][0]).toBeLessThan(r[0][1] as number);
    expect(r[0][2]).toBeGreaterThan(r[0][1] as number);

    const mc = value(invoke(SPREAD, [specRange, ladderRange, 'RMS', 'I', '3', 50, null, null]));
    const coreMc = spread(specRead, ladder, 'rms', { quantity: 'I', element: 2, trials: 50 });
    expect(mc).toEqual([[coreMc.min, coreMc.nominal, coreMc.max]]);
    expect(value(invoke(SPREAD, [specRange, ladderRange, 'RMS', 'I', 3, [[50]], null, null]))).toEqual(mc);
  });

  it('picks elements by name, reads text trials and blank trials, and applies the values override', () => {
    const byName = value(invoke(SPREAD, [specRange, ladderRange, 'peak', 'i', 'l1', '', null, 'v']));
    const core = spread(specRead, ladder, 'peak', { quantity: 'I', element: 0 });
    expect(byName).toEqual([[core.min, core.nominal, core.max]]);
    const overridden = value(invoke(SPREAD, [specRange, ladderRange, 'acrms', null, null, '20', [[22e-6], [0.02], [100e-6], [4.7]], null]));
    const coreOv = spread(specRead, ladder, 'acrms', { trials: 20, values: [22e-6, 0.02, 100e-6, 4.7] });
    expect(overridden).toEqual([[coreOv.min, coreOv.nominal, coreOv.max]]);
  });

  it('maps errors: unknown or missing measure, too many corners, bad trials, missing element', () => {
    const m = invoke(SPREAD, [specRange, ladderRange, 'ripple', null, null, null, null, null]);
    expect(m).toMatchObject({ ok: false, code: 'VALUE' });
    expect(!m.ok && m.message).toMatch(/mean, rms, acrms, peak, valley, pp, crest, thd/);
    expect(invoke(SPREAD, [specRange, ladderRange, null, null, null, null, null, null])).toMatchObject({ ok: false, code: 'VALUE' });

    const many = [['series', 'R', 1, 5], ...Array.from({ length: 17 }, () => ['shunt', 'R', 100, 5])];
    const c = invoke(SPREAD, [specRange, many, 'rms', null, null, null, null, null]);
    expect(c).toMatchObject({ ok: false, code: 'NUM' });
    expect(!c.ok && c.message).toMatch(/18 parts .* trials/);

    for (const t of [-3, 2.5, LIMITS.trials + 1]) {
      expect(invoke(SPREAD, [specRange, ladderRange, 'rms', null, null, t, null, null])).toMatchObject({ ok: false, code: 'NUM' });
    }
    expect(invoke(SPREAD, [specRange, ladderRange, 'rms', null, null, 'many', null, null])).toMatchObject({ ok: false, code: 'VALUE' });
    expect(invoke(SPREAD, [specRange, ladderRange, 'rms', 'I', 'C9', null, null, null])).toMatchObject({ ok: false, code: 'NA' });
    expect(invoke(SPREAD, [specRange, ladderRange, 'rms', 'Q', null, null, null, null])).toMatchObject({ ok: false, code: 'VALUE' });
  });
});

describe('metadata of STRESS and SPREAD', () => {
  it('follows DESIGN §3 argument lists, with help and an example for every entry', () => {
    expect(STRESS.args.map((a) => (a.optional ? `[${a.name}]` : a.name))).toEqual(['spectrum', 'ladder', '[values]', '[source]']);
    expect(SPREAD.args.map((a) => (a.optional ? `[${a.name}]` : a.name))).toEqual([
      'spectrum', 'ladder', 'measure', '[quantity]', '[element]', '[trials]', '[values]', '[source]',
    ]);
    for (const f of [STRESS, SPREAD]) {
      expect(f.result).toBe('matrix');
      expect(f.description.length).toBeGreaterThan(40);
      expect(f.example.startsWith(`=HC.${f.name}(`)).toBe(true);
      for (const a of f.args) expect(a.help.length).toBeGreaterThan(10);
    }
  });
});
