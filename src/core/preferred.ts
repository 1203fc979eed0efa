import { numError, valueError } from './errors';

/**
 * IEC 60063 preferred-number series (DESIGN §3 HC.PREFERRED), written out as published rather than generated:
 * the published tables depart from round(10^(i/n)) in places (E24: 2.7 3.0 3.3 3.6 3.9 4.3 4.7 8.2; E192: 9.20),
 * and it is the published values that parts are sold in.
 * Entries are integer mantissas of one decade: E3…E24 two significant figures (10 = 1.0), E48…E192 three
 * (100 = 1.00), so each value is m · 10^k exactly, with no binary fraction in the table.
 */
export const E_SERIES = {
  E3: [10, 22, 47],
  E6: [10, 15, 22, 33, 47, 68],
  E12: [10, 12, 15, 18, 22, 27, 33, 39, 47, 56, 68, 82],
  E24: [10, 11, 12, 13, 15, 16, 18, 20, 22, 24, 27, 30, 33, 36, 39, 43, 47, 51, 56, 62, 68, 75, 82, 91],
  E48: [
    100, 105, 110, 115, 121, 127, 133, 140, 147, 154, 162, 169, 178, 187, 196, 205,
    215, 226, 237, 249, 261, 274, 287, 301, 316, 332, 348, 365, 383, 402, 422, 442,
    464, 487, 511, 536, 562, 590, 619, 649, 681, 715, 750, 787, 825, 866, 909, 953,
  ],
  E96: [
    100, 102, 105, 107, 110, 113, 115, 118, 121, 124, 127, 130, 133, 137, 140, 143,
    147, 150, 154, 158, 162, 165, 169, 174, 178, 182, 187, 191, 196, 200, 205, 210,
    215, 221, 226, 232, 237, 243, 249, 255, 261, 267, 274, 280, 287, 294, 301, 309,
    316, 324, 332, 340, 348, 357, 365, 374, 383, 392, 402, 412, 422, 432, 442, 453,
    464, 475, 487, 499, 511, 523, 536, 549, 562, 576, 590, 604, 619, 634, 649, 665,
    681, 698, 715, 732, 750, 768, 787, 806, 825, 845, 866, 887, 909, 931, 953, 976,
  ],
  E192: [
    100, 101, 102, 104, 105, 106, 107, 109, 110, 111, 113, 114, 115, 117, 118, 120,
    121, 123, 124, 126, 127, 129, 130, 132, 133, 135, 137, 138, 140, 142, 143, 145,
    147, 149, 150, 152, 154, 156, 158, 160, 162, 164, 165, 167, 169, 172, 174, 176,
    178, 180, 182, 184, 187, 189, 191, 193, 196, 198, 200, 203, 205, 208, 210, 213,
    215, 218, 221, 223, 226, 229, 232, 234, 237, 240, 243, 246, 249, 252, 255, 258,
    261, 264, 267, 271, 274, 277, 280, 284, 287, 291, 294, 298, 301, 305, 309, 312,
    316, 320, 324, 328, 332, 336, 340, 344, 348, 352, 357, 361, 365, 370, 374, 379,
    383, 388, 392, 397, 402, 407, 412, 417, 422, 427, 432, 437, 442, 448, 453, 459,
    464, 470, 475, 481, 487, 493, 499, 505, 511, 517, 523, 530, 536, 542, 549, 556,
    562, 569, 576, 583, 590, 597, 604, 612, 619, 626, 634, 642, 649, 657, 665, 673,
    681, 690, 698, 706, 715, 723, 732, 741, 750, 759, 768, 777, 787, 796, 806, 816,
    825, 835, 845, 856, 866, 876, 887, 898, 909, 920, 931, 942, 953, 965, 976, 988,
  ],
} as const satisfies Record<string, readonly number[]>;

export type SeriesName = keyof typeof E_SERIES;
export const SERIES_NAMES = Object.keys(E_SERIES) as SeriesName[];
export type Direction = 'nearest' | 'up' | 'down';
const DIRECTIONS: readonly Direction[] = ['nearest', 'up', 'down'];

/** Relative slack so that an E-value carrying float noise (4.7e-6 = 46.999…e-7) still counts as itself. */
const SNAP = 1e-9;
/** Below the normal double range the decade arithmetic loses digits. */
const SMALLEST = 1e-300;

const clip = (v: unknown): string => {
  const t = String(v);
  return t.length > 40 ? `${t.slice(0, 37)}...` : t;
};

/** `E24`, `e24`, `24` or 24 → 'E24'. */
export function parseSeries(series: unknown, what = 'series'): SeriesName {
  if (series === undefined || series === null || series === '') return 'E24';
  const key = typeof series === 'number' ? `E${series}` : typeof series === 'string' ? series.trim().toUpperCase() : '';
  const name = (/^\d+$/.test(key) ? `E${key}` : key) as SeriesName;
  if (!(name in E_SERIES)) {
    throw valueError(`${what} '${clip(series)}' is not an IEC 60063 series: use ${SERIES_NAMES.join(', ')} (or the number alone).`);
  }
  return name;
}

function parseDirection(direction: unknown, what = 'direction'): Direction {
  if (direction === undefined || direction === null || direction === '') return 'nearest';
  const d = typeof direction === 'string' ? direction.trim().toLowerCase() : '';
  if (!(DIRECTIONS as readonly string[]).includes(d)) {
    throw valueError(`${what} '${clip(direction)}' is not allowed: use ${DIRECTIONS.join(', ')}.`);
  }
  return d as Direction;
}

/**
 * The preferred value for `value` in any decade: `nearest` by ratio (log distance; an exact tie goes up),
 * `up` = smallest series value ≥ value, `down` = largest ≤ value. The result is the clean decimal m·10^k
 * (4.7e-6, not 4.700000000000001e-6).
 */
export function preferred(value: number, series: unknown = 'E24', direction: unknown = 'nearest'): number {
  if (typeof value !== 'number') throw valueError('value must be a positive number.');
  if (!Number.isFinite(value) || !(value > 0)) throw numError(`value must be a positive finite number, got ${value}.`);
  if (value < SMALLEST) throw numError(`value ${value} is below ${SMALLEST}, too small for a preferred value.`);
  const name = parseSeries(series);
  const dir = parseDirection(direction);
  const table: readonly number[] = E_SERIES[name];
  const n = table.length;
  const lead = table[0] === 10 ? 1 : 2; // digits after the first in each mantissa

  // Scale so the decade's mantissas compare directly: scaled ≈ value / 10^(e − lead) ∈ [table[0], 10·table[0]).
  const e = Math.floor(Math.log10(value));
  const scaled = value / 10 ** (e - lead);
  // Index j runs one step past each end of the decade (j = −1 is the previous decade's top, j = n the next
  // decade's first), which absorbs a log10 or scaling error of a few ulps at a decade boundary.
  const at = (j: number): number => (j < 0 ? table[n - 1] / 10 : j >= n ? table[0] * 10 : table[j]);

  let down = -1;
  while (down < n && at(down + 1) <= scaled * (1 + SNAP)) down++;
  let up = down;
  if (!(at(down) >= scaled * (1 - SNAP))) up = down + 1;

  let j: number;
  if (dir === 'down') j = down;
  else if (dir === 'up' || up === down) j = up;
  else {
    const lo = at(down);
    const hi = at(up);
    // Compare against the geometric mean; within rounding noise of it counts as a tie, which goes up.
    j = scaled * scaled >= lo * hi * (1 - 1e-12) ? up : down;
  }

  const shift = j < 0 ? -1 : j >= n ? 1 : 0;
  const m = table[(j + n) % n];
  const result = Number(`${m}e${e - lead + shift}`);
  if (!Number.isFinite(result)) {
    throw numError(`value ${value} has no ${name} value above it within the number range (about 1.8e308).`);
  }
  return result;
}
