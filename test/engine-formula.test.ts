/** Formula text conversions between saved files, the engine and people (common practice, no source). */
import { engineFormula, normaliseFormula, toStoredFormula } from '../src/engine/formula-text';

describe('normaliseFormula (as a person reads a saved formula)', () => {
  it.each([
    ['_xldudf_HC.PULSE(0,1,0.5,10,3)', '=HC.PULSE(0,1,0.5,10,3)'],
    ['[2]!_xldudf_HC.RMS(A1:D4)', '=HC.RMS(A1:D4)'],
    ['_xldudf_HC_VALUE("4k7")', '=HC.VALUE("4k7")'],
    ['_xlfn.STDEV.S(A1:A9)', '=STDEV.S(A1:A9)'],
    ['_xlfn._xlws.FILTER(A1:A9,B1:B9)', '=FILTER(A1:A9,B1:B9)'],
    ['_xlfn.LET(_xlpm.x,2,_xlpm.x*3)', '=LET(x,2,x*3)'],
    ['=IF(A1>0,"_xldudf_ stays ""_xlfn.X""",B1)', '=IF(A1>0,"_xldudf_ stays ""_xlfn.X""",B1)'],
  ])('%s → %s', (stored, expected) => {
    expect(normaliseFormula(stored)).toBe(expected);
  });
});

describe('engineFormula (as HyperFormula parses it)', () => {
  it.each([
    ['=HC.RMS(A1:D5, TRUE)', '=HC.RMS(A1:D5, TRUE())'],
    ['=IF(A1=FALSE,"TRUE",1E-6)', '=IF(A1=FALSE(),"TRUE",1e-6)'],
    ['=TRUE()', '=TRUE()'],
    ["='TRUE'!A1+TRUE!B2", "='TRUE'!A1+TRUE!B2"],
    ['=E1+2.5E+3', '=E1+2.5e+3'],
    ['=Sheet1E2!A1', '=Sheet1E2!A1'],
  ])('%s → %s', (text, expected) => {
    expect(engineFormula(text)).toBe(expected);
  });
});

describe('toStoredFormula (as Excel saves a formula)', () => {
  it('prefixes add-in and newer built-in functions, not strings or classic functions', () => {
    expect(toStoredFormula('=HC.PKPK(HC.RESPONSE(src, ladder)) + SUM(A1:A3)')).toBe('_xldudf_HC.PKPK(_xldudf_HC.RESPONSE(src, ladder)) + SUM(A1:A3)');
    expect(toStoredFormula('=FILTER(A1:A3, B1:B3) & "HC.PKPK(x)"')).toBe('_xlfn._xlws.FILTER(A1:A3, B1:B3) & "HC.PKPK(x)"');
    expect(toStoredFormula('=STDEV.S(A1:A3)')).toBe('_xlfn.STDEV.S(A1:A3)');
  });

  it('round-trips through normaliseFormula', () => {
    const f = '=HC.THD(HC.PULSE(-1, 1, 0.5, 50, 199), "rms")';
    expect(normaliseFormula(toStoredFormula(f))).toBe(f);
  });
});
