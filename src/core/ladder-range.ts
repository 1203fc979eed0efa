import { numError } from './errors';
import { describeElement, L, LadderTable, R } from './ladder';
import { formatEng } from './units';

/**
 * The range of part values and element impedances the ladder solver works in. The solver combines element
 * impedances by sums, products and quotients (network.ts); far outside this range a product overflows or
 * underflows, and a sum whose terms are not finite reads as an exact cancellation, so the answer could be a
 * silent 0 (measured before this check: 1e306 H at 1 kHz gave an impedance of 0 Ω, as did two 1e-200 Ω
 * resistors in parallel). Real parts (fF to kF, nH to kH, µΩ to TΩ, at µHz to THz) sit tens of decades inside.
 */
export const IMPEDANCE_RANGE = { min: 1e-60, max: 1e60 } as const;
const SPAN = '1e-60 … 1e60';

const UNIT = ['Ω', 'H', 'F'] as const;
const NOUN = ['resistance', 'inductance', 'capacitance'] as const;

/**
 * Refuse (NUM) a ladder whose values, or whose element impedances at the positive frequencies from fMin to
 * fMax (Hz; none when fMax ≤ 0), leave IMPEDANCE_RANGE. `tolerance` widens each value by its ± band
 * (tolerance spreads). `values` replaces the value column as in the functions.
 */
export function checkLadderRange(
  table: LadderTable,
  fMin: number,
  fMax: number,
  opts: { values?: ArrayLike<number>; tolerance?: boolean } = {},
): void {
  const { min, max } = IMPEDANCE_RANGE;
  const wMin = 2 * Math.PI * fMin;
  const wMax = 2 * Math.PI * fMax;
  for (let i = 0; i < table.rows; i++) {
    const v = opts.values ? opts.values[i] : table.value[i];
    const t = opts.tolerance ? table.tolerance[i] / 100 : 0;
    const lo = v * (1 - t);
    const hi = v * (1 + t);
    const kind = table.kind[i];
    const where = (): string => `ladder ${describeElement(table, i)}`; // worded only for an error
    if (!(lo >= min && hi <= max)) {
      const band = t > 0 ? ` (${formatEng(lo, UNIT[kind])} … ${formatEng(hi, UNIT[kind])} with its tolerance)` : '';
      throw numError(
        `${where()}: the ${NOUN[kind]} ${formatEng(v, UNIT[kind])}${band} is outside the ${SPAN} ${UNIT[kind]} the ladder ` +
          'solver works in; check the value and its unit.',
      );
    }
    if (kind === R || !(fMax > 0)) continue;
    // |Z| = ωL or 1/(ωC): its extremes over the band of values and frequencies.
    const zLow = kind === L ? wMin * lo : 1 / (wMax * hi);
    const zHigh = kind === L ? wMax * hi : 1 / (wMin * lo);
    if (!(zLow >= min && zHigh <= max)) {
      const atHigh = !(zHigh <= max);
      const f = (kind === L) === atHigh ? fMax : fMin;
      const z = atHigh ? zHigh : zLow;
      const shown = Number.isFinite(z) ? formatEng(z, 'Ω') : 'more than 1.8e308 Ω';
      throw numError(
        `${where()}: ${formatEng(v, UNIT[kind])} at ${formatEng(f, 'Hz')} has an impedance of ${shown}, outside the ` +
          `${SPAN} Ω the ladder solver works in; check the value, its unit and the frequency.`,
      );
    }
  }
}

/** The lowest and highest positive frequency among a list (0, 0 when there is none). */
export function positiveSpan(freqs: ArrayLike<number>): [number, number] {
  let lo = Infinity;
  let hi = 0;
  for (let k = 0; k < freqs.length; k++) {
    const f = freqs[k];
    if (f > 0) {
      if (f < lo) lo = f;
      if (f > hi) hi = f;
    }
  }
  return hi > 0 ? [lo, hi] : [0, 0];
}

/** The lowest and highest frequency n·f0 (n ≥ 1) at which a spectrum has a nonzero phasor (0, 0 when none). */
export function harmonicSpan(s: { f0: number; re: ArrayLike<number>; im: ArrayLike<number> }): [number, number] {
  let first = 0;
  let last = 0;
  for (let n = 1; n < s.re.length; n++) {
    if (s.re[n] !== 0 || s.im[n] !== 0) {
      if (first === 0) first = n;
      last = n;
    }
  }
  return last > 0 ? [first * s.f0, last * s.f0] : [0, 0];
}
