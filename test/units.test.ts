import fc from 'fast-check';
import { formatEng, normalizeUnit, parsePartValue, parseValue } from '../src/core/units';
import { codeOf, messageOf } from './support/failure';


describe('parseValue: IEC 60062 letter code (letter stands for the decimal point)', () => {
  // IEC 60062, examples as listed in REFERENCES.md.
  it.each([
    ['R47', 0.47],
    ['4R7', 4.7],
    ['4K7', 4700],
    ['47K3', 47300],
    ['M47', 470000],
    ['4p7', 4.7e-12],
    ['2n2', 2.2e-9],
    ['100n', 1e-7],
    ['2u2', 2.2e-6],
    ['2\u00b52', 2.2e-6], // IEC 60062: µ may be written u (MICRO SIGN)
    ['2\u03bc2', 2.2e-6], // GREEK SMALL LETTER MU, the other µ in use
  ])('%s = %p', (text, expected) => {
    expect(parseValue(text)).toBe(expected);
  });

  // Common practice, no source: other letters of the same code and lower-case forms seen on drawings.
  it.each([
    ['4k7', 4700],
    ['1M5', 1.5e6],
    ['2G2', 2.2e9],
    ['1T0', 1e12],
    ['3m3', 3.3e-3],
    ['6f8', 6.8e-15],
    ['4r7', 4.7],
    ['R010', 0.01],
    ['0R1', 0.1],
    ['k47', 470],
    ['4k7\u2126', 4700],
    ['4K7 ohm', 4700],
    ['2u2F', 2.2e-6],
    ['2u2 F', 2.2e-6],
    ['4R7 \u03a9', 4.7],
    ['  4k7  ', 4700],
  ])('%s = %p', (text, expected) => {
    expect(parseValue(text)).toBe(expected);
  });

  it('is exact: 4k7 is 4700 and 2u2 is the double of the literal 2.2e-6', () => {
    // Common practice, no source: the value must be the decimal one, not a product of two rounded doubles.
    expect(parseValue('4k7')).toBe(4700);
    expect(parseValue('2u2')).toBe(2.2e-6);
    expect(parseValue('4n7')).toBe(4.7e-9);
    expect(parseValue('3m3')).toBe(0.0033);
    expect(parseValue('4.7k')).toBe(4700);
    expect(parseValue('2.2 mH')).toBe(0.0022);
    // The same checks fail for the naive float product, so they do test something:
    expect(parseValue('6p8')).toBe(6.8e-12);
    expect(4.7 * 1e-9).not.toBe(4.7e-9);
    expect(6.8 * 1e-12).not.toBe(6.8e-12);
  });

  it('matches Number() of the decimal string for every code of 1–4 digits and every letter', () => {
    // Common practice, no source: the reference is JavaScript's own correctly rounded decimal reading.
    const letters: Array<[string, number]> = [
      ['R', 0], ['f', -15], ['p', -12], ['n', -9], ['u', -6], ['m', -3], ['k', 3], ['K', 3], ['M', 6], ['G', 9],
    ];
    let checked = 0;
    for (const digits of ['1', '22', '47', '330', '4700', '68', '909', '1001', '0', '05', '9999']) {
      for (let cut = 0; cut < digits.length; cut++) {
        const before = digits.slice(0, cut);
        const after = digits.slice(cut);
        for (const [letter, exp] of letters) {
          const expected = Number(`${before || '0'}.${after}e${exp}`);
          expect(parseValue(`${before}${letter}${after}`)).toBe(expected);
          checked++;
        }
      }
    }
    expect(checked).toBeGreaterThan(200);
  });
});

describe('parseValue: numbers, SI prefixes and units', () => {
  it('passes numbers through', () => {
    expect(parseValue(4700)).toBe(4700);
    expect(parseValue(-2.5)).toBe(-2.5);
    expect(Object.is(parseValue(-0), 0)).toBe(true);
  });

  // Common practice, no source: plain decimal and exponent text as a spreadsheet user types it.
  it.each([
    ['10', 10],
    ['1e-6', 1e-6],
    ['2.2E3', 2200],
    ['2.2e+3', 2200],
    ['-3.3', -3.3],
    ['+5', 5],
    ['\u22125', -5],
    ['.5', 0.5],
    ['5.', 5],
    [' 12 ', 12],
    ['0', 0],
    ['1e-6 F', 1e-6],
  ])('%s = %p', (text, expected) => {
    expect(parseValue(text)).toBe(expected);
  });

  // SI Brochure (BIPM) prefix values; the letter-case rule m = milli, M = mega is part of it.
  it.each([
    ['100n', 1e-7],
    ['100 n', 1e-7],
    ['100nF', 1e-7],
    ['100 nF', 1e-7],
    ['2.2 mH', 2.2e-3],
    ['2.2 MHz', 2.2e6],
    ['2.2 mHz', 2.2e-3],
    ['10 m', 0.01],
    ['10 M', 1e7],
    ['4.7k', 4700],
    ['4.7 K', 4700],
    ['1 G', 1e9],
    ['1 T', 1e12],
    ['10 pF', 1e-11],
    ['10 fF', 1e-14],
    ['10 f', 1e-14], // a lone lower-case f is femto
    ['10 F', 10], // upper-case F is the farad
    ['22 uF', 2.2e-5],
    ['22 \u00b5F', 2.2e-5],
    ['22 \u03bcF', 2.2e-5],
    ['22\u00b5', 2.2e-5],
    ['1 ms', 1e-3],
    ['5 mA', 5e-3],
    ['12 V', 12],
    ['50 Hz', 50],
  ])('%s = %p', (text, expected) => {
    expect(parseValue(text)).toBe(expected);
  });

  // IEC 60062: R after a number is the ohm (10R = 10 Ω). The rest: common practice, no source.
  it.each([
    ['10R', 10],
    ['10 R', 10],
    ['10\u2126', 10],
    ['10 \u03a9', 10],
    ['10 ohm', 10],
    ['10 ohms', 10],
    ['10 kohm', 1e4],
    ['10 Kohm', 1e4],
    ['10 Ohms', 10],
    ['1 M\u2126', 1e6],
    ['10 m\u2126', 0.01],
    ['10 uf', 1e-5],
    ['50 hz', 50],
    ['10 uh', 1e-5],
  ])('%s = %p (unit spellings)', (text, expected) => {
    expect(parseValue(text)).toBe(expected);
  });

  it('accepts non-breaking and narrow spaces as SI writing uses them', () => {
    expect(parseValue('100\u00a0nF')).toBe(1e-7);
    expect(parseValue('100\u202fnF')).toBe(1e-7);
  });
});

describe('parseValue: unit argument', () => {
  it('accepts the same unit, any spelling of the ohm, and case-folded symbols', () => {
    expect(parseValue('10 uF', 'F')).toBe(1e-5);
    expect(parseValue('10 uF', 'f')).toBe(1e-5);
    expect(parseValue('4k7', '\u2126')).toBe(4700);
    expect(parseValue('4R7', 'ohm')).toBe(4.7);
    expect(parseValue('10 ohm', 'R')).toBe(10);
    expect(parseValue('10 \u03a9', '\u2126')).toBe(10);
    expect(parseValue('50 hz', 'Hz')).toBe(50);
    expect(parseValue('100n', 'F')).toBe(1e-7); // no unit written: taken to be in the asked unit
    expect(parseValue(3, 'H')).toBe(3);
    expect(parseValue('3', '')).toBe(3);
    expect(parseValue('3', null)).toBe(3);
  });

  it('rejects a different written unit with a message naming both', () => {
    expect(codeOf(() => parseValue('10 uH', 'F'))).toBe('VALUE');
    const msg = messageOf(() => parseValue('10 uH', 'F', 'C1'));
    expect(msg).toContain("'10 uH'");
    expect(msg).toContain('in H');
    expect(msg).toContain('F is asked');
    expect(msg).toContain('C1');
    expect(codeOf(() => parseValue('4R7', 'H'))).toBe('VALUE'); // R in the code means ohms
    expect(messageOf(() => parseValue('4R7', 'H'))).toContain('IEC 60062');
    expect(codeOf(() => parseValue('10R', 'F'))).toBe('VALUE');
    expect(codeOf(() => parseValue('1 ms', 'Hz'))).toBe('VALUE');
  });

  it('rejects an unknown unit argument, listing the known ones', () => {
    expect(codeOf(() => parseValue('10', 'W'))).toBe('VALUE');
    expect(messageOf(() => parseValue('10', 'W'))).toContain('Hz');
    expect(codeOf(() => parseValue('10', 'S'))).toBe('VALUE'); // S is the siemens, not the second
    expect(normalizeUnit('ohms')).toBe('\u2126');
    expect(normalizeUnit('HZ')).toBe('Hz');
    expect(normalizeUnit(' ')).toBeNull();
  });
});

describe('parseValue: errors', () => {
  it.each(['4k7k', 'abc', '4.7k7', '1e', '10 S', '10 k \u2126', '4R7F', '4k7 k', 'k', 'R', '1,5', '1..5', '--1', '10 kk', '2u2u2'])(
    "'%s' is a VALUE error that quotes the text and shows the allowed forms",
    (text) => {
      expect(codeOf(() => parseValue(text))).toBe('VALUE');
      const msg = messageOf(() => parseValue(text, undefined, 'R3 value'));
      expect(msg).toContain(`'${text}'`);
      expect(msg).toContain('R3 value');
      expect(msg).toMatch(/4k7|IEC 60062/);
    },
  );

  it('rejects empty text and non-text with VALUE, out-of-range numbers with NUM', () => {
    expect(codeOf(() => parseValue(''))).toBe('VALUE');
    expect(codeOf(() => parseValue('   '))).toBe('VALUE');
    expect(codeOf(() => parseValue(null))).toBe('VALUE');
    expect(codeOf(() => parseValue(undefined))).toBe('VALUE');
    expect(codeOf(() => parseValue(true))).toBe('VALUE');
    expect(codeOf(() => parseValue([1]))).toBe('VALUE');
    expect(codeOf(() => parseValue(NaN))).toBe('VALUE');
    expect(codeOf(() => parseValue(Infinity))).toBe('NUM');
    expect(codeOf(() => parseValue('1e400'))).toBe('NUM');
    expect(codeOf(() => parseValue('1e-400'))).toBe('NUM');
    expect(codeOf(() => parseValue('1e99999999999999999999'))).toBe('NUM');
    expect(codeOf(() => parseValue('9'.repeat(400) + 'T9'))).toBe('NUM');
    expect(parseValue('0e99999999999999999999')).toBe(0);
  });

  it('shortens very long text in the message', () => {
    const msg = messageOf(() => parseValue('x'.repeat(500)));
    expect(msg.length).toBeLessThan(300);
  });
});

describe('parsePartValue', () => {
  it('applies the unit implied by the kind', () => {
    expect(parsePartValue('4k7', 'R')).toBe(4700);
    expect(parsePartValue('10R', 'R')).toBe(10);
    expect(parsePartValue('2.2 mH', 'L')).toBe(0.0022);
    expect(parsePartValue('100n', 'C')).toBe(1e-7);
    expect(parsePartValue(1e-6, 'C')).toBe(1e-6);
    expect(codeOf(() => parsePartValue('10 uH', 'C'))).toBe('VALUE');
    expect(codeOf(() => parsePartValue('4R7', 'L'))).toBe('VALUE');
    expect(codeOf(() => parsePartValue('1 kohm', 'C'))).toBe('VALUE');
  });

  it('requires a value greater than zero and a known kind', () => {
    expect(codeOf(() => parsePartValue(0, 'R'))).toBe('NUM');
    expect(codeOf(() => parsePartValue('-1k', 'R'))).toBe('NUM');
    expect(messageOf(() => parsePartValue('0', 'L', 'L2'))).toContain('L2');
    expect(codeOf(() => parsePartValue('1', 'X' as 'R'))).toBe('VALUE');
  });
});

describe('formatEng', () => {
  // SI Brochure (BIPM) §5.4.3: a space separates the number from the unit; the prefix is attached to the unit.
  it.each([
    [4700, '', 3, '4.70 k'],
    [4700, '\u2126', 3, '4.70 k\u2126'],
    [2.2e-6, 'F', 3, '2.20 \u00b5F'],
    [2.2e-6, '', 3, '2.20 \u00b5'],
    [0, '', 3, '0.00'],
    [0, 'V', 3, '0.00 V'],
    [-0, '', 3, '0.00'],
    [1, '', 3, '1.00'],
    [50, 'Hz', 3, '50.0 Hz'],
    [-0.00022, 'V', 3, '-220 \u00b5V'],
    [999.4, '', 3, '999'],
    [999.7, '', 3, '1.00 k'], // rounding carries into the next prefix
    [999_950, '\u2126', 4, '1.000 M\u2126'],
    [0.00099996, 'A', 4, '1.000 mA'],
    [47000, '', 1, '50 k'],
    [1234.5678, '', 6, '1.23457 k'],
    [1 / 3, '', 15, '333.333333333333 m'],
    [1e-15, '', 3, '1.00 f'],
    [999e12, '', 3, '999 T'],
    [1e15, '', 3, '1.00e15'],
    [1e-18, 'F', 3, '1.00e-18 F'],
    [1.5e-16, 'F', 3, '150e-18 F'],
    [1e300, '', 2, '1.0e300'],
  ])('formatEng(%p, %p, %p) = %p', (value, unit, digits, expected) => {
    expect(formatEng(value, unit, digits)).toBe(expected);
  });

  it('uses defaults for omitted (null) arguments and the MICRO SIGN U+00B5', () => {
    expect(formatEng(2.2e-6)).toBe('2.20 \u00b5');
    expect(formatEng(2.2e-6, null, null)).toBe('2.20 \u00b5');
    expect(formatEng(2.2e-6, 'F').codePointAt(5)).toBe(0xb5);
  });

  it('rejects bad digits and non-finite values', () => {
    expect(codeOf(() => formatEng(1, '', 0))).toBe('NUM');
    expect(codeOf(() => formatEng(1, '', 16))).toBe('NUM');
    expect(codeOf(() => formatEng(1, '', 2.5))).toBe('NUM');
    expect(codeOf(() => formatEng(1, '', NaN))).toBe('VALUE');
    expect(codeOf(() => formatEng(NaN))).toBe('VALUE');
    expect(codeOf(() => formatEng(Infinity))).toBe('NUM');
    expect(codeOf(() => formatEng(1, 5 as unknown as string))).toBe('VALUE');
  });

  it('round-trips through parseValue to exactly the value rounded to `digits` figures', () => {
    // Common practice, no source: both sides are one correctly rounded decimal reading.
    const units = ['', '\u2126', 'F', 'H', 'Hz', 'V', 'A', 's', 'ohm'];
    fc.assert(
      fc.property(
        fc.double({ min: -30, max: 30, noNaN: true }),
        fc.double({ min: 1, max: 10, noNaN: true }),
        fc.boolean(),
        fc.integer({ min: 1, max: 15 }),
        fc.integer({ min: 0, max: units.length - 1 }),
        (e, m, neg, digits, ui) => {
          const x = (neg ? -1 : 1) * m * 10 ** Math.round(e);
          const text = formatEng(x, units[ui], digits);
          expect(parseValue(text)).toBe(Number(x.toPrecision(digits)));
        },
      ),
      { seed: 60062, numRuns: 3000 },
    );
  });

  it('keeps full precision at 15 digits', () => {
    for (const x of [Math.PI, 1 / 7, 2.2e-6, 4700, 123456789.123, 6.02214076e23, 1.602176634e-19]) {
      const back = parseValue(formatEng(x, '', 15));
      expect(Math.abs(back - x) / Math.abs(x)).toBeLessThan(5e-15);
    }
  });
});
