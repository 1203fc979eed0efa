import { numError, valueError } from '../core/errors';
import { grouped, LIMITS } from '../core/limits';
import { order } from '../core/spectrum';
import { combine, pulse, pwl, ramp, rectified, sampled, sine } from '../core/waveforms';
import { crest, mean, power, rms, thd, trace, valueAt } from '../core/measures';
import { peak, pp, valley } from '../core/extremes-scaled';
import { formatEng, parseValue } from '../core/units';
import { preferred } from '../core/preferred';
import { asBool, asChoice, asScalar, asInteger, asNumber, asNumbers, asText, asVector, isBlank } from './coerce';
import { FunctionSpec } from './spec';
import { spectral } from './spectral';
import * as net from './network-args';
import { PARTS_FUNCTIONS } from './parts-args';

const { spectrumArg } = net;

/**
 * HC.PWL's times and values, paired by position: a blank in both at the same place is skipped (a gap in the
 * table), a blank in one only is an error (the pairs after it would shift), blanks after the last pair are
 * dropped.
 */
function pwlPoints(t: unknown, v: unknown): { times: number[]; values: number[] } {
  const opts = { blanks: 'keep' as const, max: 2 * LIMITS.pwlPoints, maxWhat: 'entries' };
  const ts = asVector(t, 'times', opts);
  const vs = asVector(v, 'values', opts);
  const times: number[] = [];
  const values: number[] = [];
  const count = Math.max(ts.length, vs.length);
  for (let k = 0; k < count; k++) {
    const a = k < ts.length ? ts[k] : null;
    const b = k < vs.length ? vs[k] : null;
    if (a === null && b === null) continue;
    if (a === null || b === null) {
      throw valueError(
        `times and values are paired by position: entry ${k + 1} of ${a === null ? 'times' : 'values'} is blank (or missing) ` +
          `but the other is ${a === null ? b : a}; give both or leave both blank.`,
      );
    }
    times.push(a);
    values.push(b);
    if (times.length > LIMITS.pwlPoints) throw numError(`PWL takes at most ${LIMITS.pwlPoints} points.`);
  }
  if (times.length === 0) throw valueError('times and values hold no points.');
  return { times, values };
}

const HARMONICS_HELP = `Highest harmonic order N (0…${LIMITS.harmonics}); the result spills N+1 rows n = 0…N.`;
const SPECTRUM_HELP = 'A spectrum table: rows of n, frequency (Hz), amplitude (peak), phase (deg), as spilled by HC.PULSE etc.';
const TRUNCATED_HELP =
  'TRUE: extremes of the truncated series itself (Gibbs ringing at jumps included). FALSE (default): estimate the true waveform.';

export const FUNCTIONS: FunctionSpec[] = [
  // ---- waveform → spectrum -------------------------------------------------------------------------------
  spectral({
    name: 'PULSE',
    description:
      'Spectrum of a rectangular or trapezoidal pulse train: DC and harmonics n = 0…N as rows of n, frequency, peak amplitude, phase.',
    args: [
      { name: 'low', kind: 'number', help: 'Level between pulses (e.g. 0 V).' },
      { name: 'high', kind: 'number', help: 'Level during the pulse (e.g. 12 V).' },
      { name: 'duty', kind: 'number', help: 'Fraction of the period at high, measured between 50 % points (0…1).' },
      { name: 'frequency', kind: 'number', help: 'Repetition frequency in Hz (e.g. 250 kHz).' },
      { name: 'harmonics', kind: 'integer', help: HARMONICS_HELP },
      { name: 'rise', kind: 'number', help: 'Rise time in seconds, linear edge (default 0).', optional: true },
      { name: 'fall', kind: 'number', help: 'Fall time in seconds, linear edge (default 0).', optional: true },
      { name: 'delay', kind: 'number', help: 'Shift in seconds of the 50 % point of the rising edge from t = 0 (default 0).', optional: true },
    ],
    example: '=HC.PULSE(0, 12, 0.4, 250000, 50)',
    spectrum: (low, high, duty, f, n, rise, fall, delay) =>
      pulse(
        asNumber(low, 'low'), asNumber(high, 'high'), asNumber(duty, 'duty'), asNumber(f, 'frequency'),
        asInteger(n, 'harmonics'), asNumber(rise, 'rise', 0), asNumber(fall, 'fall', 0), asNumber(delay, 'delay', 0),
      ),
  }),
  spectral({
    name: 'RAMP',
    description: 'Spectrum of a triangle or sawtooth wave: rise_fraction 0.5 triangle, 1 rising sawtooth, 0 falling sawtooth.',
    args: [
      { name: 'low', kind: 'number', help: 'Lowest level.' },
      { name: 'high', kind: 'number', help: 'Highest level.' },
      { name: 'frequency', kind: 'number', help: 'Repetition frequency in Hz.' },
      { name: 'harmonics', kind: 'integer', help: HARMONICS_HELP },
      { name: 'rise_fraction', kind: 'number', help: 'Fraction of the period spent rising, 0…1 (default 0.5, a triangle).', optional: true },
    ],
    example: '=HC.RAMP(-1, 1, 1000, 25)',
    spectrum: (low, high, f, n, rf) =>
      ramp(asNumber(low, 'low'), asNumber(high, 'high'), asNumber(f, 'frequency'), asInteger(n, 'harmonics'), asNumber(rf, 'rise_fraction', 0.5)),
  }),
  spectral({
    name: 'RECTIFIED',
    description: 'Spectrum of a full- or half-wave rectified sine; n counts multiples of the line frequency.',
    args: [
      { name: 'peak', kind: 'number', help: 'Peak of the sine before rectification (e.g. 325 V).' },
      { name: 'line_frequency', kind: 'number', help: 'Line frequency in Hz (e.g. 50).' },
      { name: 'harmonics', kind: 'integer', help: HARMONICS_HELP },
      { name: 'mode', kind: 'text', help: '"full" (default) or "half".', optional: true },
    ],
    example: '=HC.RECTIFIED(325, 50, 20)',
    spectrum: (pk, f, n, mode) =>
      rectified(asNumber(pk, 'peak'), asNumber(f, 'line_frequency'), asInteger(n, 'harmonics'),
        asChoice(mode, 'mode', { full: 'full', 'full-wave': 'full', half: 'half', 'half-wave': 'half' }, 'full')),
  }),
  spectral({
    name: 'PWL',
    description: 'Exact spectrum of a periodic piecewise-linear waveform through (time, value) points; a repeated time is a jump.',
    args: [
      { name: 'times', kind: 'range', help: 'Column of breakpoint times in seconds, increasing (repeat a time for a vertical jump).' },
      { name: 'values', kind: 'range', help: 'Column of values at those times, same count as times.' },
      { name: 'harmonics', kind: 'integer', help: HARMONICS_HELP },
      { name: 'period', kind: 'number', help: 'Period in seconds (default: last time − first time).', optional: true },
    ],
    example: '=HC.PWL({0;1E-6;4E-6;5E-6}, {0;2;2;0}, 30, 1E-5)',
    spectrum: (t, v, n, period) => {
      const { times, values } = pwlPoints(t, v);
      return pwl(times, values, asInteger(n, 'harmonics'), isBlank(period) ? undefined : asNumber(period, 'period'));
    },
  }),
  spectral({
    name: 'SAMPLED',
    description: 'Spectrum of one period of uniformly spaced samples (e.g. a scope capture), by FFT of any length.',
    args: [
      { name: 'values', kind: 'range', help: 'One period of samples, a single row or column.' },
      { name: 'sample_rate', kind: 'number', help: 'Samples per second; the fundamental is sample_rate / count.' },
      { name: 'harmonics', kind: 'integer', help: 'Highest harmonic order N, at most half the sample count; spills N+1 rows.' },
    ],
    example: '=HC.SAMPLED(B2:B129, 12800, 20)',
    spectrum: (v, rate, n) => {
      const vals = asNumbers(v, 'values', { blanks: 'trailing', max: LIMITS.samples, maxWhat: 'samples' });
      return sampled(vals, asNumber(rate, 'sample_rate'), asInteger(n, 'harmonics'));
    },
  }),
  spectral({
    name: 'SINE',
    description: 'Spectrum of a single tone with an optional DC offset (two rows: DC and the tone).',
    args: [
      { name: 'amplitude', kind: 'number', help: 'Peak amplitude (not RMS).' },
      { name: 'frequency', kind: 'number', help: 'Frequency in Hz.' },
      { name: 'phase', kind: 'number', help: 'Phase in degrees, cosine reference (default 0).', optional: true },
      { name: 'offset', kind: 'number', help: 'DC offset (default 0).', optional: true },
    ],
    example: '=HC.SINE(1.5, 50, -30)',
    spectrum: (a, f, ph, off) =>
      sine(asNumber(a, 'amplitude'), asNumber(f, 'frequency'), asNumber(ph, 'phase', 0), asNumber(off, 'offset', 0)),
  }),
  spectral({
    name: 'COMBINE',
    description: 'Superposition (sum) of spectra whose frequencies share a common fundamental.',
    args: [{ name: 'spectrum', kind: 'range', spectrum: true, help: 'Spectrum tables to add.', repeating: true }],
    example: '=HC.COMBINE(HC.SINE(1, 50), HC.SINE(0.2, 150, 90))',
    spectrum: (...specs) => {
      const given = specs.filter((s) => !isBlank(s));
      if (given.length === 0) throw valueError('COMBINE needs at least one spectrum.');
      if (given.length > LIMITS.combine) throw numError(`COMBINE takes at most ${LIMITS.combine} spectra, got ${given.length}.`);
      let rows = 0;
      const spectra = given.map((s, k) => {
        const sp = spectrumArg(s, `spectrum${k + 1}`);
        rows += order(sp) + 1;
        if (rows > LIMITS.combineRows) {
          throw numError(
            `COMBINE's spectra hold more than ${grouped(LIMITS.combineRows)} harmonic rows in all (at spectrum${k + 1}); ` +
              'combine fewer or shorter spectra.',
          );
        }
        return sp;
      });
      return combine(spectra);
    },
  }),
  // ---- network --------------------------------------------------------------------------------------------
  ...net.NETWORK_FUNCTIONS,
  // ---- measures -------------------------------------------------------------------------------------------
  {
    name: 'MEAN',
    description: 'Mean (DC) value of a spectrum.',
    args: [{ name: 'spectrum', kind: 'range', spectrum: true, help: SPECTRUM_HELP }],
    result: 'number',
    example: '=HC.MEAN(HC.PULSE(0, 5, 0.3, 1000, 20))',
    impl: (s) => mean(spectrumArg(s)),
  },
  {
    name: 'RMS',
    description: 'RMS value of the waveform of a spectrum (Parseval), with or without its DC part.',
    args: [
      { name: 'spectrum', kind: 'range', spectrum: true, help: SPECTRUM_HELP },
      { name: 'ac_only', kind: 'bool', help: 'TRUE: leave out DC (AC RMS, i.e. ripple RMS). Default FALSE.', optional: true },
    ],
    result: 'number',
    example: '=HC.RMS(HC.PULSE(0, 5, 0.5, 1000, 99))',
    impl: (s, ac) => rms(spectrumArg(s), asBool(ac, 'ac_only', false)),
  },
  // Excel needs function names of at least three characters, so peak-to-peak is PKPK (DESIGN §3 calls it PP).
  ...(['PEAK', 'VALLEY', 'PKPK'] as const).map((name): FunctionSpec => {
    const what = { PEAK: 'Largest value', VALLEY: 'Smallest value', PKPK: 'Peak-to-peak value (PEAK − VALLEY)' }[name];
    const fn = { PEAK: peak, VALLEY: valley, PKPK: pp }[name];
    return {
      name,
      description: `${what} of the waveform over one whole period.`,
      args: [
        { name: 'spectrum', kind: 'range', spectrum: true, help: SPECTRUM_HELP },
        { name: 'truncated', kind: 'bool', help: TRUNCATED_HELP, optional: true },
      ],
      result: 'number',
      example: `=HC.${name}(HC.RAMP(0, 3, 1000, 40))`,
      impl: (s, tr) => fn(spectrumArg(s), { truncated: asBool(tr, 'truncated', false) }),
    };
  }),
  {
    name: 'CREST',
    description: 'Crest factor: largest |value| over a period divided by the RMS value.',
    args: [
      { name: 'spectrum', kind: 'range', spectrum: true, help: SPECTRUM_HELP },
      { name: 'truncated', kind: 'bool', help: TRUNCATED_HELP, optional: true },
    ],
    result: 'number',
    example: '=HC.CREST(HC.RECTIFIED(1, 50, 40, "half"))',
    impl: (s, tr) => crest(spectrumArg(s), { truncated: asBool(tr, 'truncated', false) }),
  },
  {
    name: 'THD',
    description: 'Total harmonic distortion (DC excluded), relative to the fundamental or to the AC RMS.',
    args: [
      { name: 'spectrum', kind: 'range', spectrum: true, help: SPECTRUM_HELP },
      { name: 'reference', kind: 'text', help: '"fundamental" (default) or "rms".', optional: true },
    ],
    result: 'number',
    example: '=HC.THD(HC.PULSE(-1, 1, 0.5, 50, 199))',
    impl: (s, ref) =>
      thd(spectrumArg(s), asChoice<'fundamental' | 'rms'>(ref, 'reference', { fundamental: 'fundamental', f: 'fundamental', rms: 'rms', r: 'rms' }, 'fundamental')),
  },
  {
    name: 'ATTIME', // DESIGN §3 calls it AT; Excel needs names of at least three characters
    description: 'Instantaneous value of the waveform of a spectrum at a time.',
    args: [
      { name: 'spectrum', kind: 'range', spectrum: true, help: SPECTRUM_HELP },
      { name: 'time', kind: 'number', help: 'Time in seconds (t = 0 as defined by the source function).' },
    ],
    result: 'number',
    example: '=HC.ATTIME(HC.SINE(1, 50), 0.005)',
    impl: (s, t) => valueAt(spectrumArg(s), asNumber(t, 'time')),
  },
  {
    name: 'TRACE',
    description: 'Time and value columns of the waveform of a spectrum, for a chart.',
    args: [
      { name: 'spectrum', kind: 'range', spectrum: true, help: SPECTRUM_HELP },
      { name: 'points', kind: 'integer', help: `Rows to spill (2…${LIMITS.tracePoints}, default 200).`, optional: true },
      { name: 'periods', kind: 'number', help: `Periods to span (default 1, at most ${LIMITS.tracePeriods}).`, optional: true },
    ],
    result: 'matrix',
    example: '=HC.TRACE(HC.PULSE(0, 5, 0.3, 1000, 40), 100)',
    impl: (s, pts, per) => {
      const r = trace(spectrumArg(s), asInteger(pts, 'points', 200), asNumber(per, 'periods', 1));
      const rows: number[][] = new Array(r.t.length);
      for (let k = 0; k < r.t.length; k++) rows[k] = [r.t[k], r.x[k]];
      return rows;
    },
  },
  {
    name: 'POWER',
    description: 'Mean power of a voltage spectrum and a current spectrum on the same fundamental.',
    args: [
      { name: 'voltage_spectrum', kind: 'range', spectrum: true, help: 'Spectrum of the voltage across the part or port.' },
      { name: 'current_spectrum', kind: 'range', spectrum: true, help: 'Spectrum of the current into it, same fundamental.' },
    ],
    result: 'number',
    example: '=HC.POWER(HC.SINE(325, 50), HC.SINE(2, 50, -20))',
    impl: (v, i) => power(spectrumArg(v, 'voltage_spectrum'), spectrumArg(i, 'current_spectrum')),
  },
  // ---- parts and values ------------------------------------------------------------------------------------
  ...PARTS_FUNCTIONS,
  {
    name: 'VALUE',
    description: 'Reads an engineering value such as 4k7, 2u2, 100 nF or 2.2 mH as a number in base units.',
    args: [
      { name: 'text', kind: 'any', help: 'The value as text (SI prefix or IEC 60062 code) or a number.' },
      { name: 'unit', kind: 'text', help: 'Unit the text must carry if it names one: Ω (ohm, R), F, H, Hz, V, A or s.', optional: true },
    ],
    result: 'number',
    example: '=HC.VALUE("4k7")',
    impl: (t, unit) => parseValue(asScalar(t, 'text'), isBlank(unit) ? undefined : asText(unit, 'unit'), 'text'),
  },
  {
    name: 'PREFERRED',
    description: 'The IEC 60063 preferred value (E3…E192) nearest to, above or below a value, in any decade.',
    args: [
      { name: 'value', kind: 'number', help: 'A positive value, e.g. a computed capacitance.' },
      { name: 'series', kind: 'text', help: 'E3, E6, E12, E24 (default), E48, E96 or E192.', optional: true },
      { name: 'direction', kind: 'text', help: '"nearest" (default, by ratio), "up" or "down".', optional: true },
    ],
    result: 'number',
    example: '=HC.PREFERRED(5.1E-6, "E12", "up")',
    impl: (v, series, dir) =>
      preferred(asNumber(v, 'value'), isBlank(series) ? 'E24' : asText(series, 'series'), isBlank(dir) ? 'nearest' : asText(dir, 'direction')),
  },
  {
    name: 'ENG',
    description: 'Formats a number in engineering notation with an SI prefix, e.g. 4.70 kΩ.',
    args: [
      { name: 'value', kind: 'number', help: 'The number to format.' },
      { name: 'unit', kind: 'text', help: 'Unit symbol to append, e.g. "Ω", "F", "A" (default none).', optional: true },
      { name: 'digits', kind: 'integer', help: 'Significant digits, 1…15 (default 3).', optional: true },
    ],
    result: 'text',
    example: '=HC.ENG(0.0000022, "F")',
    impl: (v, unit, digits) => formatEng(asNumber(v, 'value'), isBlank(unit) ? '' : asText(unit, 'unit'), asInteger(digits, 'digits', 3)),
  },
];

export const FUNCTION_BY_NAME: ReadonlyMap<string, FunctionSpec> = new Map(FUNCTIONS.map((f) => [f.name, f]));
