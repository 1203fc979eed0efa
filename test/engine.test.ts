/**
 * The headless engine: the function table registered in HyperFormula. Expected values come from calling the
 * core (or the table through invoke) directly, so these tests check the adapter, not the math.
 */
import { DetailedCellError, HyperFormula, SimpleCellAddress } from 'hyperformula';
import { createEngine, engineContext, settleSpills } from '../src/engine';
import { FUNCTIONS, FUNCTION_BY_NAME } from '../src/functions/table';
import { invoke } from '../src/functions/invoke';
import { combine, pulse, pwl, sine } from '../src/core/waveforms';
import { spectrumFromTable, spectrumToTable } from '../src/core/spectrum';
import { rms } from '../src/core/measures';
import { parseValue } from '../src/core/units';

const at = (row: number, col: number, sheet = 0): SimpleCellAddress => ({ sheet, row, col });

/** The values of a block of cells. */
function block(hf: HyperFormula, row: number, col: number, rows: number, cols: number, sheet = 0): unknown[][] {
  return hf.getRangeValues({ start: at(row, col, sheet), end: at(row + rows - 1, col + cols - 1, sheet) });
}

function errorOf(v: unknown): DetailedCellError {
  expect(v).toBeInstanceOf(DetailedCellError);
  return v as DetailedCellError;
}

describe('registration', () => {
  it('registers every table function as HC.<NAME>', () => {
    createEngine();
    const names = new Set(HyperFormula.getRegisteredFunctionNames('enGB'));
    for (const spec of FUNCTIONS) expect(names.has(`HC.${spec.name}`)).toBe(true);
  });

  it('accepts lower-case calls and returns numbers at full double precision', () => {
    const hf = createEngine();
    // smartRounding off: HyperFormula would otherwise round to 10 significant digits.
    expect(hf.calculateFormula('=0.1+0.2', 0)).toBe(0.1 + 0.2);
    expect(hf.calculateFormula('=hc.value("1u1")', 0)).toBe(parseValue('1u1'));
    // A nested spectrum passes between the functions as a table, as between Excel cells.
    const s = spectrumFromTable(spectrumToTable(pulse(0, 12, 0.3, 250e3, 99, 20e-9, 20e-9, 0)));
    expect(hf.calculateFormula('=HC.RMS(HC.PULSE(0, 12, 0.3, 250000, 99, 20e-9, 20e-9))', 0)).toBe(rms(s));
  });
});

describe('spilled results', () => {
  it('spills a literal harmonic count to N+1 rows, bit for bit the core table', () => {
    const hf = createEngine({ S: [['=HC.PULSE(0, 12, 0.25, 400000, 5)']] });
    expect(block(hf, 0, 0, 6, 4)).toEqual(spectrumToTable(pulse(0, 12, 0.25, 400e3, 5, 0, 0, 0)));
    expect(hf.getCellValue(at(6, 0))).toBeNull();
  });

  it('spills a harmonic count read from a cell, also one below or after the formula', () => {
    const sheet: unknown[][] = [['=HC.PULSE(0, 12, 0.25, 400000, H20)']];
    sheet[19] = [null, null, null, null, null, null, null, 7];
    const hf = createEngine({ S: sheet as never });
    expect(block(hf, 0, 0, 8, 4)).toEqual(spectrumToTable(pulse(0, 12, 0.25, 400e3, 7, 0, 0, 0)));
    expect(hf.getCellValue(at(8, 0))).toBeNull();
    expect(engineContext(hf).pending.size).toBe(0);
  });

  it('sizes a chain of spills fed by formula cells (count from a formula, response of a spilled range)', () => {
    const hf = createEngine({
      S: [
        ['=HC.TRACE(A20:D28, 6)', null, null, null, '=F2*2', null, null, 'series', 'L', '10u'],
        [null, null, null, null, null, 3, null, 'shunt', 'C', '22u'],
        [null, null, null, null, null, null, null, 'shunt', 'R', '4'],
      ],
      T: [],
    });
    // The source spectrum lands below the trace, and the response after it: order of reading does not matter.
    hf.setCellContents(at(19, 0), [['=HC.RESPONSE(A30:D36, H1:J3)']]);
    hf.setCellContents(at(29, 0), [['=HC.PULSE(0, 12, 0.25, 400000, E1)']]);
    settleSpills(hf);
    const src = pulse(0, 12, 0.25, 400e3, 6, 0, 0, 0);
    expect(block(hf, 29, 0, 7, 4)).toEqual(spectrumToTable(src));
    const resp = invoke(FUNCTION_BY_NAME.get('RESPONSE')!, [spectrumToTable(src), [['series', 'L', '10u'], ['shunt', 'C', '22u'], ['shunt', 'R', '4']]]);
    expect(resp.ok).toBe(true);
    expect(block(hf, 19, 0, 7, 4)).toEqual(resp.ok && resp.value);
    const trace = invoke(FUNCTION_BY_NAME.get('TRACE')!, [resp.ok && resp.value, 6]);
    expect(block(hf, 0, 0, 6, 2)).toEqual(trace.ok && trace.value);
  });

  it('reports a spill whose size changed after an edit, and settleSpills resizes it', () => {
    const hf = createEngine({ S: [['=HC.PULSE(0, 1, 0.5, 1000, E1)', null, null, null, 4]] });
    expect(block(hf, 0, 0, 5, 4)).toEqual(spectrumToTable(pulse(0, 1, 0.5, 1000, 4, 0, 0, 0)));
    hf.setCellContents(at(0, 4), [[6]]);
    const e = errorOf(hf.getCellValue(at(0, 0)));
    expect(e.type).toBe('VALUE');
    expect(e.message).toMatch(/7 × 4 but the spill area was fixed at 5 × 4/);
    expect(e.message).toMatch(/settleSpills/);
    expect(settleSpills(hf)).toBe(0);
    expect(block(hf, 0, 0, 7, 4)).toEqual(spectrumToTable(pulse(0, 1, 0.5, 1000, 6, 0, 0, 0)));
  });

  it('spills RESPONSE, STRESS, IMPEDANCE sweeps and COMBINE to their own sizes', () => {
    const ladder = '{"series","L","10u",20,"L1";"shunt","C","47u",10,"C1";"shunt","R",4,0,"RL"}';
    const hf = createEngine({
      S: [
        [`=HC.STRESS(HC.PULSE(0, 48, 0.25, 400000, 9), ${ladder})`],
        [], [], [],
        [`=HC.IMPEDANCE(${ladder}, {1000;10000;100000;1000000;10000000})`],
        [], [], [], [], [],
        ['=HC.COMBINE(HC.SINE(1, 50), HC.SINE(0.2, 150, 90), HC.SINE(0.1, 250))'],
      ],
    });
    expect(hf.getCellValue(at(0, 0))).toBe('L1');
    expect(hf.getCellValue(at(2, 0))).toBe('RL');
    expect(hf.getCellValue(at(2, 5))).toEqual(expect.any(Number));
    expect(hf.getCellValue(at(3, 0))).toBeNull();
    expect(hf.getCellValue(at(8, 1))).toEqual(expect.any(Number));
    const expected = spectrumToTable(combine([sine(1, 50, 0, 0), sine(0.2, 150, 90, 0), sine(0.1, 250, 0, 0)]));
    expect(block(hf, 10, 0, 6, 4)).toEqual(expected);
  });

  it('computes a spilled call once: the size method and the evaluation share the result', () => {
    const calls: string[] = [];
    const hf = createEngine({ S: [['=HC.PULSE(0, 12, 0.25, 400000, B9)'], [], [], [], [], [], [], [], [null, 5]] }, { onCall: (n) => calls.push(n) });
    expect(hf.getCellValue(at(5, 1))).toBe(5 * 400000);
    expect(calls).toEqual(['PULSE']);
  });

  it('reads inline array constants', () => {
    const hf = createEngine();
    const expected = spectrumToTable(pwl([0, 1e-6, 4e-6, 5e-6], [0, 2, 2, 0], 3, 1e-5));
    expect(hf.calculateFormula('=HC.PWL({0;1e-6;4e-6;5e-6}, {0;2;2;0}, 3, 1e-5)', 0)).toEqual(expected);
    // As Excel writes them (upper-case exponents), through a sheet.
    const sheet = createEngine({ S: [['=HC.PWL({0;1E-6;4E-6;5E-6}, {0;2;2;0}, 3, 1E-5)']] });
    expect(block(sheet, 0, 0, 4, 4)).toEqual(expected);
    expect(hf.calculateFormula('=HC.MEAN({0,0,2.5,0;1,50,1,0})', 0)).toBe(2.5);
  });

  it('lifts a scalar function over a range, as a dynamic-array spreadsheet does', () => {
    const hf = createEngine({ S: [['4k7', '=HC.VALUE(A1:A3)'], ['2u2'], ['100 nF']] });
    expect(block(hf, 0, 1, 3, 1)).toEqual([[4700], [parseValue('2u2')], [parseValue('100 nF')]]);
  });
});

describe('arguments and errors', () => {
  it('maps error results to #NUM!, #VALUE! and #N/A with the table message', () => {
    const hf = createEngine();
    const num = errorOf(hf.calculateFormula('=HC.PULSE(0, 12, 0.25, 400000, -1)', 0));
    expect(num.type).toBe('NUM');
    const direct = invoke(FUNCTION_BY_NAME.get('PULSE')!, [0, 12, 0.25, 400000, -1]);
    expect(direct.ok).toBe(false);
    expect(num.message).toBe(!direct.ok && direct.message);
    expect(errorOf(hf.calculateFormula('=HC.PULSE("abc", 12, 0.25, 400000, 3)', 0)).type).toBe('VALUE');
    const na = errorOf(hf.calculateFormula('=HC.RESPONSE(HC.SINE(1, 1000), {"series","L","10u";"shunt","C","1u"}, "I", "Q9")', 0));
    expect(na.type).toBe('NA');
    expect(na.message).toMatch(/Q9/);
  });

  it('propagates an error argument, scalar or inside a range', () => {
    const hf = createEngine({ S: [[0, 0, 1, 0, '=HC.RMS(A1:D2)', '=HC.VALUE(1/0)', '=HC.TRACE(A1:D2, 4)'], [1, 50, '=NA()', 0]] });
    expect(errorOf(hf.getCellValue(at(0, 4))).type).toBe('NA');
    expect(errorOf(hf.getCellValue(at(0, 5))).type).toBe('DIV_BY_ZERO');
    expect(errorOf(hf.getCellValue(at(0, 6))).type).toBe('NA');
  });

  it('passes omitted and empty arguments as blanks, so defaults and "missing" messages come from the table', () => {
    const hf = createEngine();
    expect(hf.calculateFormula('=HC.PULSE(0, 12, 0.25, 400000, 3, , , )', 0)).toEqual(hf.calculateFormula('=HC.PULSE(0, 12, 0.25, 400000, 3)', 0));
    const missing = errorOf(hf.calculateFormula('=HC.PULSE(0, 12, 0.25, 400000)', 0));
    expect(missing.type).toBe('VALUE');
    expect(missing.message).toMatch(/harmonics is missing/);
    expect(errorOf(hf.calculateFormula('=HC.VALUE("1k", "Ω", 3)', 0)).type).toBe('NA'); // too many arguments
  });

  it('reads engineering text in cells and ranges as the Excel adapter does', () => {
    const hf = createEngine({ S: [['400k', '=HC.SINE(2, A1)']] });
    expect(block(hf, 0, 1, 2, 4)).toEqual(spectrumToTable(sine(2, 400e3, 0, 0)));
    expect(spectrumFromTable(block(hf, 0, 1, 2, 4)).f0).toBe(400e3);
  });

  it('understands saved-file prefixes and Excel spellings in sheet formulas', () => {
    const hf = createEngine({ S: [['=_xldudf_HC.VALUE("4k7")', '=_xlfn.STDEV.S(1,2,3)', '=HC.RMS({0,0,0,0;1,50,2,0}, TRUE)', '=1E-6*2']] });
    expect(block(hf, 0, 0, 1, 4)).toEqual([[4700, 1, Math.SQRT2, 2e-6]]);
  });
});
