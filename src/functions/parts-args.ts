import { valueError } from '../core/errors';
import { KIND_LETTER, LadderTable } from '../core/ladder';
import { stress } from '../core/stress';
import { MEASURES, parseMeasure, spread } from '../core/tolerance';
import { LIMITS } from '../core/limits';
import { checkLadderRange, harmonicSpan } from '../core/ladder-range';
import { asInteger, asScalar, isBlank } from './coerce';
import { elementArg, LADDER_HELP, ladderArg, spectrumArg, quantityArg, SOURCE_HELP, sourceArg, VALUES_HELP, valuesArg } from './network-args';
import { FunctionSpec } from './spec';

const SPECTRUM_HELP = 'Source spectrum table (rows n, frequency, amplitude, phase), e.g. spilled by HC.PULSE.';

/** Row label of STRESS: the designator where the ladder gives one, else "row 3 C" (1-based element row, kind). */
export function stressLabel(table: LadderTable, row: number): string {
  return table.names[row] || `row ${row + 1} ${KIND_LETTER[table.kind[row]]}`;
}

function measureArg(v: unknown) {
  const m = asScalar(v, 'measure');
  if (isBlank(m)) throw valueError(`measure is missing: give one of ${MEASURES.join(', ')}.`);
  return parseMeasure(m);
}

/** HC.STRESS and HC.SPREAD (DESIGN §3, tolerance and parts). */
export const PARTS_FUNCTIONS: FunctionSpec[] = [
  {
    name: 'STRESS',
    description:
      'Stress of every ladder part: one row per ladder row of label, I_rms, I_peak, V_rms, V_peak, mean power (W, absorbed). ' +
      'The label is the part’s name, or "row 3 C" (element row and kind) where the ladder gives none; no header row. ' +
      'Peaks are the largest |value| over a period.',
    args: [
      { name: 'spectrum', kind: 'range', spectrum: true, help: SPECTRUM_HELP },
      { name: 'ladder', kind: 'range', help: LADDER_HELP },
      { name: 'values', kind: 'range', help: VALUES_HELP, optional: true },
      { name: 'source', kind: 'text', help: SOURCE_HELP, optional: true },
    ],
    result: 'matrix',
    example: '=HC.STRESS(HC.PULSE(0, 12, 0.4, 250000, 50), A2:E6)',
    impl: (spec, ladder, values, source) => {
      const s = spectrumArg(spec);
      const table = ladderArg(ladder);
      const vals = valuesArg(values, table);
      const src = sourceArg(source);
      checkLadderRange(table, ...harmonicSpan(s), { values: vals });
      const r = stress(s, table, { values: vals, source: src });
      const rows: (number | string)[][] = new Array(table.rows);
      for (let i = 0; i < table.rows; i++) {
        rows[i] = [stressLabel(table, i), r.iRms[i], r.iPeak[i], r.vRms[i], r.vPeak[i], r.power[i]];
      }
      return rows;
    },
  },
  {
    name: 'SPREAD',
    description:
      'Min, nominal and max of a measure of a response over the ladder’s tolerances: every corner of the tolerance box, ' +
      'or a repeatable Monte Carlo run (parts uniform within ± tolerance) when trials is given. The nominal counts in min and max.',
    args: [
      { name: 'spectrum', kind: 'range', spectrum: true, help: SPECTRUM_HELP },
      { name: 'ladder', kind: 'range', help: `${LADDER_HELP} The tolerance column sets each part’s ± band.` },
      { name: 'measure', kind: 'text', help: `One of ${MEASURES.join(', ')} (acrms: RMS without DC; thd: to the fundamental).` },
      { name: 'quantity', kind: 'text', help: '"V" (default: far-end voltage, or the voltage across the element) or "I" (source current, or the current through the element).', optional: true },
      { name: 'element', kind: 'any', help: 'Element name (e.g. C2) or 1-based ladder row; omit for the far end / the source.', optional: true },
      {
        name: 'trials',
        kind: 'integer',
        help: `Omit (or 0) for every corner (at most ${LIMITS.corners}); 1…${LIMITS.trials} for that many Monte Carlo boards, the same on every recalculation.`,
        optional: true,
      },
      { name: 'values', kind: 'range', help: `${VALUES_HELP} Tolerances apply around these values.`, optional: true },
      { name: 'source', kind: 'text', help: SOURCE_HELP, optional: true },
    ],
    result: 'matrix',
    example: '=HC.SPREAD(HC.PULSE(0, 12, 0.4, 250000, 50), A2:E6, "pp")',
    impl: (spec, ladder, measure, quantity, element, trials, values, source) => {
      const s = spectrumArg(spec);
      const table = ladderArg(ladder);
      const opts = {
        quantity: quantityArg(quantity),
        element: elementArg(element, table),
        trials: isBlank(asScalar(trials, 'trials')) ? undefined : asInteger(trials, 'trials'),
        values: valuesArg(values, table),
        source: sourceArg(source),
      };
      const m = measureArg(measure);
      checkLadderRange(table, ...harmonicSpan(s), { values: opts.values, tolerance: true });
      const r = spread(s, table, m, opts);
      return [[r.min, r.nominal, r.max]];
    },
  },
];
