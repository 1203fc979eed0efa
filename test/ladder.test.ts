import { HcError } from '../src/core/errors';
import {
  ACROSS, C, checkValues, findElement, L, parseLadder, PLUS, R, SERIES, SHUNT, valuesFromGrid, withValues,
} from '../src/core/ladder';
import { LIMITS } from '../src/core/limits';
import { failure } from './support/failure';

/** The HcError code and message thrown by f ('none' when it returns). */

describe('parseLadder: roles', () => {
  it.each([
    ['series', SERIES], ['in series', SERIES], ['series branch', SERIES], ['  SERIES ', SERIES], ['In   Series', SERIES],
    ['shunt', SHUNT], ['to ground', SHUNT], ['shunt branch', SHUNT], ['Shunt to Ground', SHUNT],
  ])('branch starter %p', (word, code) => {
    const t = parseLadder([[word, 'R', 10]]);
    expect(t.role[0]).toBe(code);
    expect(t.branches).toBe(1);
  });

  it.each([
    ['+', PLUS], ['plus', PLUS], ['ADD', PLUS], ['in series with', PLUS], ['series with', PLUS],
    ['||', ACROSS], ['\u2225', ACROSS], ['//', ACROSS], ['across', ACROSS], ['Parallel', ACROSS],
    ['in parallel', ACROSS], ['parallel with', ACROSS], ['in parallel with', ACROSS],
  ])('element added to a branch %p', (word, code) => {
    const t = parseLadder([['shunt', 'C', 1e-6], [word, 'R', 0.01]]);
    expect(t.role[1]).toBe(code);
    expect(t.branches).toBe(1);
  });

  it('splits rows into branches at each series/shunt row', () => {
    const t = parseLadder([
      ['series', 'L', 1e-3], ['||', 'R', 100],
      ['shunt', 'C', 1e-6], ['+', 'R', 0.05], ['+', 'L', 1e-9],
      ['shunt', 'R', 10],
    ]);
    expect(t.rows).toBe(6);
    expect(t.branches).toBe(3);
    expect(Array.from(t.branchStart)).toEqual([0, 2, 5, 6]);
  });

  it('rejects unknown roles, listing the allowed ones', () => {
    const f = failure(() => parseLadder([['series', 'R', 1], ['paralel', 'R', 2]]));
    expect(f.code).toBe('VALUE');
    expect(f.message).toMatch(/row 2.*"paralel".*series.*shunt.*\+.*\|\|/);
  });

  it.each(['+', '||', 'across', 'plus'])('a ladder cannot start with %p', (word) => {
    const f = failure(() => parseLadder([[word, 'R', 1]]));
    expect(f.code).toBe('VALUE');
    expect(f.message).toMatch(/first element must start a branch/);
  });
});

describe('parseLadder: kinds, values, tolerances, names', () => {
  it.each([
    ['R', R], ['r', R], ['Resistor', R], ['resistance', R],
    ['L', L], ['l', L], ['INDUCTOR', L], ['inductance', L],
    ['C', C], ['c', C], ['capacitor', C], ['Capacitance', C],
  ])('kind %p', (word, code) => {
    expect(parseLadder([['series', word, 1]]).kind[0]).toBe(code);
  });

  it('rejects unknown kinds', () => {
    const f = failure(() => parseLadder([['series', 'X', 1]]));
    expect(f.code).toBe('VALUE');
    expect(f.message).toMatch(/kind "X".*R, L or C/);
  });

  // Value text uses units.ts (IEC 60062 letter code, SI prefixes); common practice, no source.
  it.each([
    ['R', '4k7', 4700], ['R', '10R', 10], ['R', '2.2 kohm', 2200], ['R', '1 \u03a9', 1],
    ['L', '2.2 mH', 2.2e-3], ['L', '4u7', 4.7e-6], ['L', 10e-6, 10e-6],
    ['C', '100 nF', 1e-7], ['C', '2u2', 2.2e-6], ['C', '4p7', 4.7e-12],
  ])('%s value %p = %p', (kind, text, expected) => {
    expect(parseLadder([['shunt', kind, text]]).value[0]).toBe(expected);
  });

  it('rejects a unit that does not fit the kind, and non-positive or non-finite values', () => {
    expect(failure(() => parseLadder([['series', 'C', '100 nH']])).code).toBe('VALUE');
    expect(failure(() => parseLadder([['series', 'L', '4k7']])).code).toBe('none'); // 4.7 kH is a value, if odd
    expect(failure(() => parseLadder([['series', 'R', 0]])).code).toBe('NUM');
    expect(failure(() => parseLadder([['series', 'R', -1]])).code).toBe('NUM');
    expect(failure(() => parseLadder([['series', 'R', Infinity]])).code).toBe('NUM');
    expect(failure(() => parseLadder([['series', 'R', '']])).code).toBe('VALUE');
    expect(failure(() => parseLadder([['series', 'R']])).code).toBe('VALUE');
    expect(failure(() => parseLadder([['series', 'R', 'abc']])).message).toMatch(/row 1: value/);
  });

  it('reads tolerances as ± percent, blank = 0', () => {
    const t = parseLadder([
      ['series', 'R', 1, 5], ['shunt', 'C', 1, '10%'], ['shunt', 'L', 1, ' \u00b120 % '], ['shunt', 'R', 1, ''],
      ['shunt', 'R', 1, 0], ['shunt', 'R', 1, null], ['shunt', 'R', 1, '+/-1'],
    ]);
    expect(Array.from(t.tolerance)).toEqual([5, 10, 20, 0, 0, 0, 1]);
  });

  it('rejects tolerances outside [0, 100) and non-numbers', () => {
    expect(failure(() => parseLadder([['series', 'R', 1, 100]])).code).toBe('NUM');
    expect(failure(() => parseLadder([['series', 'R', 1, -1]])).code).toBe('NUM');
    expect(failure(() => parseLadder([['series', 'R', 1, 'five']])).code).toBe('VALUE');
    expect(failure(() => parseLadder([['series', 'R', 1, true]])).code).toBe('VALUE');
  });

  it('keeps names, and rejects duplicates case-insensitively', () => {
    const t = parseLadder([['series', 'L', 1e-3, '', 'L1'], ['shunt', 'C', 1e-6, 5, ' C1 '], ['shunt', 'R', 10]]);
    expect(t.names).toEqual(['L1', 'C1', '']);
    const f = failure(() => parseLadder([['series', 'L', 1, 0, 'X1'], ['shunt', 'C', 1, 0, 'x1']]));
    expect(f.code).toBe('VALUE');
    expect(f.message).toMatch(/"x1" is already used by element 1/);
  });
});

describe('parseLadder: table shape', () => {
  it('skips one header row and blank rows, and counts element rows only', () => {
    const t = parseLadder([
      ['role', 'kind', 'value', 'tolerance %', 'name'],
      [null, null, null, null, null],
      ['series', 'R', 100, null, 'R1'],
      ['', '', '', '', ''],
      ['shunt', 'C', '1u', null, 'C1'],
    ]);
    expect(t.rows).toBe(2);
    expect(Array.from(t.sheetRow)).toEqual([3, 5]);
    expect(findElement(t, 'C1')).toBe(1);
  });

  it('does not treat a second text row as a header', () => {
    expect(failure(() => parseLadder([['role', 'kind', 'value'], ['what', 'ever', 'x']])).code).toBe('VALUE');
  });

  it('does not swallow a first row with a mistyped role as a header', () => {
    const f = failure(() => parseLadder([['serie', 'L', 1e-3], ['shunt', 'C', 1e-6]]));
    expect(f.code).toBe('VALUE');
    expect(f.message).toMatch(/role "serie"/);
  });

  it('accepts a single flat row', () => {
    expect(parseLadder(['shunt', 'R', 50]).rows).toBe(1);
  });

  it('rejects empty input, non-tables, only headers and extra columns', () => {
    expect(failure(() => parseLadder([])).code).toBe('VALUE');
    expect(failure(() => parseLadder('series R 1')).code).toBe('VALUE');
    expect(failure(() => parseLadder([['role', 'kind', 'value']])).code).toBe('VALUE');
    expect(failure(() => parseLadder([[null, ''], []])).code).toBe('VALUE');
    expect(failure(() => parseLadder([['series', 'R', 1, 0, 'R1', 'extra']])).code).toBe('VALUE');
    expect(parseLadder([['series', 'R', 1, 0, 'R1', '', null]]).rows).toBe(1);
  });

  it(`allows ${LIMITS.ladderRows} rows and no more`, () => {
    const rows = Array.from({ length: LIMITS.ladderRows }, () => ['shunt', 'R', 1]);
    expect(parseLadder(rows).rows).toBe(LIMITS.ladderRows);
    const f = failure(() => parseLadder([...rows, ['shunt', 'R', 1]]));
    expect(f.code).toBe('NUM');
    expect(f.message).toMatch(String(LIMITS.ladderRows));
  });
});

describe('values override and element lookup', () => {
  const t = parseLadder([['series', 'L', 1e-3, 10, 'L1'], ['shunt', 'C', 1e-6, 5, 'C1'], ['shunt', 'R', 10]]);

  it('withValues replaces the value column without touching the original', () => {
    const u = withValues(t, [2e-3, 2e-6, 20]);
    expect(Array.from(u.value)).toEqual([2e-3, 2e-6, 20]);
    expect(Array.from(t.value)).toEqual([1e-3, 1e-6, 10]);
    expect(u.role).toBe(t.role);
  });

  it('checks the length and positivity of an override', () => {
    expect(failure(() => withValues(t, [1, 2])).code).toBe('VALUE');
    expect(failure(() => withValues(t, [1, 2])).message).toMatch(/3 rows.*has 2/);
    expect(failure(() => checkValues(t, [1, 0, 2])).code).toBe('NUM');
    expect(failure(() => checkValues(t, [1, 0, 2])).message).toMatch(/C1 \(row 2\)/);
    expect(failure(() => checkValues(t, Float64Array.from([1, 1, NaN]))).code).toBe('VALUE');
    expect(failure(() => checkValues(t, [1, 1, Infinity])).code).toBe('NUM');
  });

  it('reads an override from a row or a column, with text values in the row kind\u2019s unit', () => {
    expect(Array.from(valuesFromGrid([['1m', '1u', '10R']], t))).toEqual([1e-3, 1e-6, 10]);
    expect(Array.from(valuesFromGrid([[2e-3], ['2 \u00b5F'], [20]], t))).toEqual([2e-3, 2e-6, 20]);
    expect(failure(() => valuesFromGrid([[1, 2]], t)).code).toBe('VALUE');
    expect(failure(() => valuesFromGrid([[1, 2], [3, 4]], t)).code).toBe('VALUE');
    expect(failure(() => valuesFromGrid([['1 mF', '1u', 10]], t)).code).toBe('VALUE');
    expect(failure(() => valuesFromGrid([[1, -1, 1]], t)).code).toBe('NUM');
  });

  it('finds elements by name (any case) or 1-based row', () => {
    expect(findElement(t, 'l1')).toBe(0);
    expect(findElement(t, ' C1 ')).toBe(1);
    expect(findElement(t, 3)).toBe(2);
    expect(findElement(t, '3')).toBe(2);
    expect(findElement(t, null)).toBe(-1);
    expect(findElement(t, '')).toBe(-1);
  });

  it('reports a missing element as NA, listing names and rows', () => {
    const f = failure(() => findElement(t, 'R9'));
    expect(f.code).toBe('NA');
    expect(f.message).toMatch(/"R9".*L1, C1.*rows 1 to 3/);
    expect(failure(() => findElement(t, 4)).code).toBe('NA');
    expect(failure(() => findElement(t, 0)).code).toBe('NA');
    expect(failure(() => findElement(t, 1.5)).code).toBe('NUM');
    expect(failure(() => findElement(t, true)).code).toBe('VALUE');
  });
});
