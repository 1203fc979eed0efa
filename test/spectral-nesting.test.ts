/**
 * Spectra handed from a nested call to the enclosing one without their tables (src/functions/spectral.ts,
 * src/engine/values.ts SpectrumRange). The rules checked here (common practice, no source):
 * - a spectrum-producing entry's impl is exactly the table of its spectrum;
 * - every argument marked `spectrum` reads a SpectrumValue as it reads the table (same result to rounding,
 *   same errors), and every argument read through spectrumArg is marked;
 * - in the engine, an enclosing HC call gets the exact phasors (the core's result to the bit), while a cell,
 *   a built-in function or an unmarked argument sees the very table the impl returns.
 */
import { HyperFormula, RawCellContent } from 'hyperformula';
import { createEngine } from '../src/engine';
import { FUNCTIONS, FUNCTION_BY_NAME } from '../src/functions/table';
import { invoke, invokeSpectrum } from '../src/functions/invoke';
import { SpectrumValue } from '../src/functions/spectral';
import { callKey, sameArgs } from '../src/engine/memo-key';
import { Spectrum, spectrumFromTable, spectrumToTable } from '../src/core/spectrum';
import { pulse, sine } from '../src/core/waveforms';
import { parseLadder } from '../src/core/ladder';
import { response } from '../src/core/response';
import { rms, thd } from '../src/core/measures';
import { pp } from '../src/core/extremes-scaled';
import { FunctionSpec } from '../src/functions/spec';

const LADDER_ROWS: RawCellContent[][] = [
  ['role', 'kind', 'value', 'tol %', 'name'],
  ['series', 'L', 10e-6, 20, 'L1'],
  ['+', 'R', 0.02, 10, 'RL'],
  ['shunt', 'C', 22e-6, 20, 'C1'],
  ['+', 'R', 0.005, 10, 'ESR'],
  ['shunt', 'R', 3.3, 5, 'RLOAD'],
];
const LADDER = parseLadder(LADDER_ROWS as unknown[][]);
const SOURCE = pulse(0, 12, 0.4, 250e3, 60, 20e-9, 20e-9, 0);

const spec = (name: string): FunctionSpec => FUNCTION_BY_NAME.get(name)!;

/** Arguments for a call of each function taking spectra: the spectrum slots as `s`, the rest fixed. */
const CALLS: Record<string, (s: unknown) => unknown[]> = {
  RESPONSE: (s) => [s, LADDER_ROWS, 'I', 'C1', null, null],
  STRESS: (s) => [s, LADDER_ROWS, null, null],
  SPREAD: (s) => [s, LADDER_ROWS, 'rms', 'V', null, null],
  COMBINE: (s) => [s, spectrumToTable(sine(1, 750e3, 30, 0)), s],
  MEAN: (s) => [s],
  RMS: (s) => [s, true],
  PEAK: (s) => [s, null],
  VALLEY: (s) => [s, null],
  PKPK: (s) => [s, true],
  CREST: (s) => [s, null],
  THD: (s) => [s, 'rms'],
  ATTIME: (s) => [s, 1e-6],
  TRACE: (s) => [s, 16, 1],
  POWER: (s) => [s, s],
};

describe('the function table', () => {
  it('marks exactly the arguments read as spectra, and each such function is exercised here', () => {
    const marked = FUNCTIONS.filter((f) => f.args.some((a) => a.spectrum)).map((f) => f.name).sort();
    expect(marked).toEqual(Object.keys(CALLS).sort());
    for (const f of FUNCTIONS) {
      for (const a of f.args) {
        // Every spectrum argument is a range; every range named like a spectrum is marked.
        if (a.spectrum) expect(a.kind).toBe('range');
        if (/spectrum$/.test(a.name)) expect([f.name, a.name, a.spectrum]).toEqual([f.name, a.name, true]);
      }
    }
  });

  it('has impl = the table of spectrum for every spectrum-producing entry', () => {
    const producers = FUNCTIONS.filter((f) => f.spectrum).map((f) => f.name).sort();
    expect(producers).toEqual(['COMBINE', 'PULSE', 'PWL', 'RAMP', 'RECTIFIED', 'RESPONSE', 'SAMPLED', 'SINE']);
    const args: Record<string, unknown[]> = {
      PULSE: [0, 12, 0.4, 250e3, 20, 20e-9, 30e-9, 1e-7],
      RAMP: [-1, 2, 1e3, 15, 0.3],
      RECTIFIED: [325, 50, 12, 'half'],
      PWL: [[[0], [1e-6], [4e-6], [5e-6]], [[0], [2], [2], [0]], 12, 1e-5],
      SAMPLED: [[[0, 1, 3, 2, -1, -2, 0.5, 0]], 8000, 4],
      SINE: [1.5, 50, -30, 0.2],
      COMBINE: [spectrumToTable(sine(1, 50, 0, 0)), spectrumToTable(sine(0.2, 150, 90, 0))],
      RESPONSE: [spectrumToTable(SOURCE), LADDER_ROWS, 'V', null, null, null],
    };
    for (const name of producers) {
      const viaImpl = invoke(spec(name), args[name]);
      const viaSpectrum = invokeSpectrum(spec(name), args[name]);
      if (!viaImpl.ok || !viaSpectrum.ok) throw new Error(`${name} failed`);
      expect(viaImpl.value).toEqual(spectrumToTable(viaSpectrum.spectrum));
    }
  });

  it('gives the same errors through invokeSpectrum as through invoke', () => {
    const bad: [string, unknown[]][] = [
      ['PULSE', [0, 12, 1.5, 250e3, 20]], // duty beyond 1
      ['SINE', [1, 1e308, 0, 0]], // fine spectrum…
      ['RAMP', [0, 1, 1e307, 100]], // …whose harmonic frequencies overflow: only the table step can tell
      ['RESPONSE', [spectrumToTable(SOURCE), [['series', 'L', 'oops']], null, null, null, null]],
    ];
    for (const [name, args] of bad) {
      const a = invoke(spec(name), args);
      const b = invokeSpectrum(spec(name), args);
      expect(b.ok).toBe(a.ok);
      if (!a.ok && !b.ok) expect([b.code, b.message]).toEqual([a.code, a.message]);
    }
  });
});

describe('a SpectrumValue argument', () => {
  it('gives what the table gives, for every function taking spectra', () => {
    const table = spectrumToTable(SOURCE);
    const parsed = spectrumFromTable(table);
    for (const [name, call] of Object.entries(CALLS)) {
      const viaTable = invoke(spec(name), call(table));
      const viaValue = invoke(spec(name), call(new SpectrumValue(parsed)));
      if (!viaTable.ok) throw new Error(`${name}: ${viaTable.message}`);
      // The table parses to `parsed`, so both calls compute from the same phasors.
      expect([name, viaValue]).toEqual([name, viaTable]);
    }
  });

  it('reads as its table in an argument that is not a spectrum', () => {
    const value = new SpectrumValue(SOURCE);
    // A spectrum given as the ladder: the same refusal as for the table itself.
    const a = invoke(spec('IMPEDANCE'), [value, 1e3, null, null]);
    const b = invoke(spec('IMPEDANCE'), [spectrumToTable(SOURCE), 1e3, null, null]);
    expect(a.ok).toBe(false);
    expect(a).toEqual(b);
  });

  it('keys the memo by its phasors', () => {
    const a = [new SpectrumValue(SOURCE), 'x'];
    const same = [new SpectrumValue({ f0: SOURCE.f0, re: SOURCE.re.slice(), im: SOURCE.im.slice() }), 'x'];
    const im = SOURCE.im.slice();
    im[7] = Math.fround(im[7]); // one phasor differs in its low bits
    const other = [new SpectrumValue({ f0: SOURCE.f0, re: SOURCE.re, im }), 'x'];
    expect(callKey('RMS', a)).toBe(callKey('RMS', same));
    expect(sameArgs(a, same)).toBe(true);
    expect(callKey('RMS', a)).not.toBe(callKey('RMS', other));
    expect(sameArgs(a, other)).toBe(false);
    expect(sameArgs(a, [spectrumToTable(SOURCE), 'x'])).toBe(false);
  });
});

describe('nested calls in the engine', () => {
  const SPEC = 'HC.PULSE(0, 12, 0.4, 250000, 60, 20E-9, 20E-9)';
  let hf: HyperFormula;
  beforeAll(() => {
    const rows: RawCellContent[][] = LADDER_ROWS.map((r) => [...r]);
    const formulas = [
      `=HC.RMS(HC.RESPONSE(${SPEC}, A1:E6))`,
      `=HC.PKPK(HC.RESPONSE(${SPEC}, A1:E6, "I", "C1"))`,
      `=HC.THD(HC.COMBINE(HC.SINE(1, 50), HC.SINE(0.2, 150, 90)), "rms")`,
      `=INDEX(HC.RESPONSE(${SPEC}, A1:E6), 4, 3)`,
      `=SUM(HC.SINE(2, 50, 10, 1))`,
      `=HC.RMS(HC.PULSE(0, 12, 1.5, 250000, 60))`,
      `=HC.RESPONSE(${SPEC}, ${SPEC})`,
      `=HC.RMS(IF(TRUE, HC.SINE(3, 50)))`,
    ];
    formulas.forEach((f, k) => {
      rows[k] = [...(rows[k] ?? [null, null, null, null, null]), null, f];
    });
    rows[10] = [`=HC.RESPONSE(${SPEC}, A1:E6, , , , "current")`];
    hf = createEngine({ S: rows });
  });
  const at = (row: number, col: number) => hf.getCellValue({ sheet: 0, row, col });

  it('passes the exact phasors to an enclosing HC call (the core to the bit)', () => {
    const source = pulse(0, 12, 0.4, 250e3, 60, 20e-9, 20e-9, 0);
    expect(at(0, 6)).toBe(rms(response(source, LADDER)));
    expect(at(1, 6)).toBe(pp(response(source, LADDER, { quantity: 'I', element: 2 })));
    const combined = spec('COMBINE').spectrum!(new SpectrumValue(sine(1, 50, 0, 0)), new SpectrumValue(sine(0.2, 150, 90, 0)));
    expect(at(2, 6)).toBe(thd(combined as Spectrum, 'rms'));
  });

  it('writes the table for a built-in function, a spill and an argument that is not a spectrum', () => {
    const table = spectrumToTable(response(SOURCE, LADDER));
    expect(at(3, 6)).toBe(table[3][2]);
    expect(at(4, 6)).toBe(spectrumToTable(sine(2, 50, 10, 1)).flat().reduce((a, b) => a + b, 0));
    // The spilled table is the impl's own, cell for cell.
    const spilled = hf.getRangeValues({ start: { sheet: 0, row: 10, col: 0 }, end: { sheet: 0, row: 70, col: 3 } });
    expect(spilled).toEqual(spectrumToTable(response(SOURCE, LADDER, { source: 'current' })));
    // Through IF (not an HC call) the spectrum still arrives, as its table.
    expect(at(7, 6)).toBe(rms(spectrumFromTable(spectrumToTable(sine(3, 50, 0, 0)))));
  });

  it('passes a nested error on with its message, and refuses a spectrum given as a ladder as the table would be', () => {
    const err = at(5, 6) as { type: string; message: string };
    const direct = invoke(spec('PULSE'), [0, 12, 1.5, 250000, 60]);
    if (direct.ok) throw new Error('expected an error');
    expect([err.type, err.message]).toEqual(['NUM', direct.message]);
    const refused = at(6, 6) as { type: string; message: string };
    const byTable = invoke(spec('RESPONSE'), [spectrumToTable(SOURCE), spectrumToTable(SOURCE), null, null, null, null]);
    if (byTable.ok) throw new Error('expected an error');
    expect(refused.message).toBe(byTable.message);
  });
});
