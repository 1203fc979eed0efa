import { finite, numError, valueError } from './errors';
import { LIMITS } from './limits';

/**
 * Engineering values as people write them in a bill of materials (DESIGN §2 value column, §3 HC.VALUE / HC.ENG):
 *   plain numbers      10, -3.3, 1e-6, 2.2E3
 *   SI prefix + unit   100n, 100 nF, 2.2 mH, 4.7k, 10 kohm, 1 µs (space optional)
 *   IEC 60062 code     4R7 = 4.7, R47 = 0.47, 4K7 = 4700, M47 = 470e3, 2u2 = 2.2e-6 (letter = decimal point)
 * A leading sign (+, -, U+2212) is accepted on every form; surrounding and inner spaces may be any Unicode space.
 * Values are exact decimals: the digits and the shifted exponent go into one decimal string that Number()
 * rounds once, so 4k7 is exactly 4700 and 2u2 is the same double as the literal 2.2e-6.
 */

/** SI prefix letter → power of ten. Case matters: m = milli, M = mega; k and K are both kilo. */
const PREFIX: Readonly<Record<string, number>> = {
  f: -15, p: -12, n: -9, u: -6, '\u00b5': -6, '\u03bc': -6, m: -3, k: 3, K: 3, M: 6, G: 9, T: 12,
};

/** Canonical unit symbols. Ω is returned as U+2126 (OHM SIGN). */
export type Unit = '\u2126' | 'F' | 'H' | 'Hz' | 'V' | 'A' | 's';
const OHM: Unit = '\u2126';

/** Unit spellings matched exactly. R after a number is the ohm (IEC 60062: 10R = 10 Ω). */
const UNIT_EXACT: Readonly<Record<string, Unit>> = {
  '\u2126': OHM, '\u03a9': OHM, ohm: OHM, ohms: OHM, R: OHM,
  F: 'F', H: 'H', Hz: 'Hz', V: 'V', A: 'A', s: 's',
};
/** Lower-case spellings also accepted (10 uf, 50 hz, 10 Kohm). `s` is left out: upper-case S is the siemens. */
const UNIT_FOLDED: Readonly<Record<string, Unit>> = {
  ohm: OHM, ohms: OHM, r: OHM, f: 'F', h: 'H', hz: 'Hz', v: 'V', a: 'A',
};

const UNIT_LIST = 'Ω (or ohm, R), F, H, Hz, V, A, s';
const FORMS = 'write a number (10, 1e-6, 2.2E3), a prefixed value (4.7k, 100 nF, 2.2 mH) or a letter code (4k7, 2u2, R47)';

const DECIMAL = /^([+\-\u2212]?)(\d+(?:\.\d*)?|\.\d+)(?:[eE]([+\-\u2212]?\d+))?\s*(\S*)$/;
const LETTER_CODE = /^([+\-\u2212]?)(\d*)([Rr\u00b5\u03bcfpnumkKMGT])(\d+)\s*(\S*)$/;

/** A table entry for `key`, never an inherited property (a text such as "constructor" names nothing). */
function own<T>(table: Readonly<Record<string, T>>, key: string): T | undefined {
  return Object.prototype.hasOwnProperty.call(table, key) ? table[key] : undefined;
}

function unitOf(word: string): Unit | undefined {
  return own(UNIT_EXACT, word) ?? own(UNIT_FOLDED, word.toLowerCase());
}

/** Split a suffix into prefix exponent and unit. Exact-case readings win, so a lone `f` is femto and `F` farad. */
function readSuffix(s: string): { exp: number; unit: Unit | null } | null {
  if (s === '') return { exp: 0, unit: null };
  const exact = own(UNIT_EXACT, s);
  if (exact) return { exp: 0, unit: exact };
  const p = own(PREFIX, s[0]);
  if (p !== undefined) {
    const rest = s.slice(1);
    if (rest === '') return { exp: p, unit: null };
    const u = unitOf(rest);
    if (u) return { exp: p, unit: u };
  }
  const u = own(UNIT_FOLDED, s.toLowerCase());
  return u ? { exp: 0, unit: u } : null;
}

/** Canonical unit for a unit argument (case-insensitive except S, which is not the second). */
export function normalizeUnit(unit: unknown, what = 'unit'): Unit | null {
  if (unit === undefined || unit === null) return null;
  if (typeof unit !== 'string') throw valueError(`${what} must be text, one of ${UNIT_LIST}.`);
  if (unit.length > LIMITS.textLength) throw valueError(`${what} '${quote(unit)}' is not a known unit: use ${UNIT_LIST}.`);
  const u = unit.trim();
  if (u === '') return null;
  const found = unitOf(u);
  if (!found) throw valueError(`${what} '${quote(u)}' is not a known unit: use ${UNIT_LIST}.`);
  return found;
}

const quote = (t: string): string => (t.length > 40 ? `${t.slice(0, 37)}...` : t);

/** Exponents beyond this are out of double range anyway; clamping keeps the decimal string well formed. */
const EXP_CLAMP = 9999;

function toNumber(sign: string, intDigits: string, fracDigits: string, exp: number, text: string, what: string): number {
  const e = Math.max(-EXP_CLAMP, Math.min(EXP_CLAMP, exp));
  const x = Number(`${sign === '-' || sign === '\u2212' ? '-' : ''}${intDigits || '0'}.${fracDigits || '0'}e${e}`);
  const nonzero = /[1-9]/.test(intDigits) || /[1-9]/.test(fracDigits);
  if (!Number.isFinite(x)) throw numError(`${what} '${quote(text)}' is too large: the largest value is about 1.8e308.`);
  if (x === 0 && nonzero) throw numError(`${what} '${quote(text)}' is too small: the smallest value is about 5e-324.`);
  return x + 0; // −0 → 0
}

function checkUnit(found: Unit | null, wanted: Unit | null, text: string, what: string, fromCode: boolean): void {
  if (!found || !wanted || found === wanted) return;
  const why = fromCode ? ' (R marks ohms in the IEC 60062 letter code)' : '';
  throw valueError(
    `${what} '${quote(text)}' is in ${found}${why}, but ${wanted} is asked for here: write it in ${wanted} or as a bare number.`,
  );
}

/**
 * Read an engineering value. Numbers pass through (finite check); text is read as described above.
 * `unit`, when given, must agree with a unit written in the text (Ω, ohm and R are one unit);
 * a value written without a unit is taken to be in that unit.
 */
export function parseValue(input: unknown, unit?: string | null, what = 'value'): number {
  const wanted = normalizeUnit(unit);
  if (typeof input === 'number') return finite(input, what) + 0;
  if (input === undefined || input === null) throw valueError(`${what} is missing: ${FORMS}.`);
  if (typeof input !== 'string') throw valueError(`${what} must be a number or text: ${FORMS}.`);
  // The patterns below backtrack quadratically on long digit runs; no engineering value is this long.
  if (input.length > LIMITS.textLength) {
    throw numError(`${what} is a text of ${input.length} characters; a value is at most ${LIMITS.textLength} characters long.`);
  }
  const text = input.trim();
  if (text === '') throw valueError(`${what} is empty: ${FORMS}.`);

  const d = DECIMAL.exec(text);
  if (d) {
    const suffix = readSuffix(d[4]);
    if (suffix) {
      checkUnit(suffix.unit, wanted, text, what, false);
      const [intDigits, fracDigits = ''] = d[2].split('.');
      const exp = (d[3] ? clampInt(d[3]) : 0) + suffix.exp;
      return toNumber(d[1], intDigits, fracDigits, exp, text, what);
    }
  }
  const c = LETTER_CODE.exec(text);
  if (c) {
    const isR = c[3] === 'R' || c[3] === 'r';
    const tail = c[5] === '' ? { exp: 0, unit: null } : readSuffix(c[5]);
    // After a letter code only a unit may follow (4k7Ω, 2u2 F), never a second prefix.
    if (tail && tail.exp === 0) {
      if (isR && tail.unit && tail.unit !== OHM) {
        throw valueError(`${what} '${quote(text)}' mixes R (ohms, IEC 60062) with the unit ${tail.unit}: ${FORMS}.`);
      }
      checkUnit(isR ? OHM : tail.unit, wanted, text, what, isR && !tail.unit);
      return toNumber(c[1], c[2], c[4], isR ? 0 : (own(PREFIX, c[3]) as number), text, what);
    }
  }
  throw valueError(`could not read ${what} '${quote(text)}': ${FORMS}; units ${UNIT_LIST}.`);
}

function clampInt(s: string): number {
  const neg = s[0] === '-' || s[0] === '\u2212';
  const digits = s.replace(/^[+\-\u2212]/, '').replace(/^0+(?=\d)/, '');
  const n = digits.length > 6 ? EXP_CLAMP + 1 : Number(digits);
  return neg ? -n : n;
}

export type PartKind = 'R' | 'L' | 'C';
const PART_UNIT: Readonly<Record<PartKind, Unit>> = { R: OHM, L: 'H', C: 'F' };
const PART_NOUN: Readonly<Record<PartKind, string>> = { R: 'resistance', L: 'inductance', C: 'capacitance' };

/** A ladder element value: the unit follows from the kind (Ω for R, H for L, F for C) and it must be > 0. */
export function parsePartValue(input: unknown, kind: PartKind, what = 'value'): number {
  const unit = PART_UNIT[kind];
  if (!unit) throw valueError(`${what}: part kind must be R, L or C.`);
  const x = parseValue(input, unit, what);
  if (!(x > 0)) throw numError(`${what} must be a ${PART_NOUN[kind]} greater than 0 ${unit}, got ${x}.`);
  return x;
}

/** Engineering prefixes by exponent / 3 + 5 (f … T). µ is U+00B5, the sign most fonts and keyboards carry. */
const ENG_PREFIX = ['f', 'p', 'n', '\u00b5', 'm', '', 'k', 'M', 'G', 'T'];
const ENG_MIN = -15;
const ENG_MAX = 12;

/**
 * Engineering notation: mantissa 1 ≤ |m| < 1000 with `digits` significant digits, exponent a multiple of 3
 * shown as an SI prefix. Following SI writing, a space separates the number from prefix+unit
 * ("4.70 kΩ", "4.70 k", "220 mV"); no unit and no prefix gives the bare number ("4.70").
 * Outside f…T the exponent is written out ("1.00e-18 F"). Every output reads back with parseValue.
 */
export function formatEng(value: number, unit: string | null = '', digits: number | null = 3): string {
  finite(value, 'value');
  const nd = digits ?? 3;
  if (typeof nd !== 'number' || Number.isNaN(nd)) throw valueError('digits must be a whole number from 1 to 15.');
  if (!(nd >= 1 && nd <= 15 && Math.floor(nd) === nd)) {
    throw numError(`digits must be a whole number from 1 to 15, got ${nd}.`);
  }
  if (unit !== null && typeof unit !== 'string') throw valueError('unit must be text, such as Ω, F or Hz.');
  const u = (unit ?? '').trim();

  // toExponential rounds once in decimal, so a carry to the next decade (999.7 → 1.00e3) is already done.
  const [mant, expText] = (value === 0 ? 0 : value).toExponential(nd - 1).split('e');
  const e10 = Number(expText);
  const e3 = Math.floor(e10 / 3) * 3;
  const neg = mant[0] === '-';
  const digitsOnly = mant.replace(/^-/, '').replace('.', '');
  const intLen = e10 - e3 + 1;
  const padded = digitsOnly.length < intLen ? digitsOnly + '0'.repeat(intLen - digitsOnly.length) : digitsOnly;
  const frac = padded.slice(intLen);
  const num = `${neg ? '-' : ''}${padded.slice(0, intLen)}${frac ? '.' + frac : ''}`;

  if (value === 0) return u ? `${num} ${u}` : num;
  if (e3 < ENG_MIN || e3 > ENG_MAX) return `${num}e${e3}${u ? ' ' + u : ''}`;
  const prefix = ENG_PREFIX[e3 / 3 + 5];
  const tail = prefix + u;
  return tail ? `${num} ${tail}` : num;
}
