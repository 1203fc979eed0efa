/**
 * The Excel adapter without a build: the generated file matches the table, and excel-runtime maps results and
 * errors the way Excel expects. Common practice, no source.
 */
import * as fs from 'fs';
import { GENERATED_PATH, renderExcelAdapter } from '../scripts/generate-excel';
import { excelCall, excelError } from '../src/functions/excel-runtime';
import { invoke } from '../src/functions/invoke';
import { FUNCTIONS, FUNCTION_BY_NAME } from '../src/functions/table';

/** A stand-in for Excel's CustomFunctions global, recording associations. */
class StandInError {
  constructor(public code: string, public message?: string) {}
}
const ERROR_CODES = {
  invalidValue: '#VALUE!',
  notAvailable: '#N/A',
  divisionByZero: '#DIV/0!',
  invalidNumber: '#NUM!',
  nullReference: '#NULL!',
  invalidName: '#NAME?',
  invalidReference: '#REF!',
};
const g = globalThis as unknown as { CustomFunctions?: unknown };

const ladder = [
  ['series', 'R', 10],
  ['shunt', 'C', '1u'],
];

describe('excel.generated.ts', () => {
  const text = fs.readFileSync(GENERATED_PATH, 'utf8');

  test('is exactly what the generator makes from the table (run `npm run generate` if not)', () => {
    expect(text).toBe(renderExcelAdapter(FUNCTIONS));
  });

  test('declares and associates one top-level function per table entry, in table order', () => {
    const declared = [...text.matchAll(/^export function ([A-Z][A-Z0-9_]*)\(/gm)].map((m) => m[1]);
    const associated = [...text.matchAll(/^associate\('([A-Z0-9_.]+)', ([A-Z0-9_]+)\);$/gm)].map((m) => [m[1], m[2]]);
    const names = FUNCTIONS.map((f) => f.name);
    expect(declared).toEqual(names);
    expect(associated).toEqual(names.map((n) => [n, n]));
  });

  test('marks optional arguments with [name] and gives range arguments a matrix type', () => {
    const pulseDoc = text.slice(text.indexOf('@customfunction PULSE'), text.indexOf('export function PULSE'));
    expect(pulseDoc).toMatch(/@param \{any\} \[rise\] /);
    expect(pulseDoc).toMatch(/@param \{any\} low /);
    expect(pulseDoc).toMatch(/@returns \{any\[\]\[\]\}/);
    const rmsDoc = text.slice(text.indexOf('@customfunction RMS'), text.indexOf('export function RMS'));
    expect(rmsDoc).toMatch(/@param \{any\[\]\[\]\} spectrum /);
    expect(rmsDoc).toMatch(/@returns \{number\}/);
  });

  test('refuses table text that would break the JSDoc', () => {
    const bad = { ...FUNCTION_BY_NAME.get('RMS')!, description: 'ends the comment */ early' };
    expect(() => renderExcelAdapter([bad])).toThrow(/\*\//);
    const tag = { ...FUNCTION_BY_NAME.get('RMS')!, description: 'mentions @param inside' };
    expect(() => renderExcelAdapter([tag])).toThrow(/JSDoc tag/);
    const dup = FUNCTION_BY_NAME.get('RMS')!;
    expect(() => renderExcelAdapter([dup, dup])).toThrow(/twice/);
  });
});

describe('excel-runtime', () => {
  beforeEach(() => {
    g.CustomFunctions = { Error: StandInError, ErrorCode: ERROR_CODES, associate: () => undefined };
  });
  afterEach(() => {
    delete g.CustomFunctions;
  });

  test('returns what the table returns for good arguments', () => {
    const spec = FUNCTION_BY_NAME.get('PULSE')!;
    const args = [0, 12, 0.4, '250k', 5];
    const direct = invoke(spec, args);
    expect(direct.ok).toBe(true);
    expect(excelCall('PULSE', args)).toEqual(direct.ok && direct.value);
    expect(excelCall('VALUE', ['4k7', null])).toBe(4700);
  });

  test('maps VALUE, NUM and NA to the Excel error codes and keeps the message', () => {
    const num = excelCall('PULSE', [0, 12, 2, 1000, 5]) as StandInError;
    expect(num).toBeInstanceOf(StandInError);
    expect(num.code).toBe('#NUM!');
    expect(num.message).toMatch(/duty/);

    const value = excelCall('RMS', ['not a spectrum', null]) as StandInError;
    expect(value).toBeInstanceOf(StandInError);
    expect(value.code).toBe('#VALUE!');
    expect(value.message).toMatch(/spectrum/);

    const spectrum = excelCall('SINE', [1, 50]);
    const na = excelCall('RESPONSE', [spectrum, ladder, 'I', 'C9']) as StandInError;
    expect(na).toBeInstanceOf(StandInError);
    expect(na.code).toBe('#N/A');
    expect(na.message).toMatch(/C9/);
  });

  test('passes the occurrences of a repeating argument as separate arguments', () => {
    const a = excelCall('SINE', [1, 50]);
    const b = excelCall('SINE', [0.2, 150, 90]);
    const combined = excelCall('COMBINE', [], [a, b]);
    const direct = invoke(FUNCTION_BY_NAME.get('COMBINE')!, [a, b]);
    expect(direct.ok).toBe(true);
    expect(combined).toEqual(direct.ok && direct.value);
  });

  test('treats undefined like an omitted argument and never throws', () => {
    expect(excelCall('VALUE', ['2u2', undefined])).toBeCloseTo(2.2e-6, 18);
    const unknown = excelCall('NO_SUCH_FUNCTION', []) as StandInError;
    expect(unknown.code).toBe('#N/A');
    expect(() => excelCall('PULSE', [Symbol('x') as unknown])).not.toThrow();
  });

  test('without the CustomFunctions API the message comes back as text', () => {
    delete g.CustomFunctions;
    expect(excelError('NUM', 'too big')).toBe('#NUM: too big');
    expect(excelCall('PULSE', [0, 12, 2, 1000, 5])).toMatch(/^#NUM: duty/);
  });
});
