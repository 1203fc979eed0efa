/**
 * `cell`: one far-end response of the 6-element ladder at 200 harmonics plus its RMS and peak-to-peak.
 * Ours, on the BENCH line: the core (response → rms, pp), as a cell's work is done once its arguments are
 * read. Also shown (INFO): the same through the function table entries (HC.RESPONSE → HC.RMS, HC.PKPK), tables
 * in and out exactly as one spreadsheet cell chain calls them, which adds reading and writing the spectrum
 * tables. Baseline: mathjs written the straightforward way (baseline-mathjs.ts).
 */
import { FUNCTION_BY_NAME } from '../../src/functions/table';
import { invoke } from '../../src/functions/invoke';
import { pp } from '../../src/core/extremes-scaled';
import { rms } from '../../src/core/measures';
import { response } from '../../src/core/response';
import { farEndPhasors, ppOf, rmsOf } from '../baseline-mathjs';
import { consume, LADDER, LADDER_ROWS, source, sourceTable } from '../fixtures';
import { benchLine, pair } from '../timing';

const HARMONICS = 200;

function call(name: string, ...args: unknown[]): unknown {
  const r = invoke(FUNCTION_BY_NAME.get(name)!, args);
  if (!r.ok) throw new Error(`HC.${name}: ${r.message}`);
  return r.value;
}

export function runCell(log: (s: string) => void): void {
  const src = sourceTable(HARMONICS);
  const spec = source(HARMONICS);
  const core = (): [number, number] => {
    const v = response(spec, LADDER);
    return [rms(v), pp(v)];
  };
  const entries = (): [number, number] => {
    const resp = call('RESPONSE', src, LADDER_ROWS);
    return [call('RMS', resp) as number, call('PKPK', resp) as number];
  };
  const baseline = (): [number, number] => {
    const v = farEndPhasors(src, LADDER);
    return [rmsOf(v), ppOf(v)];
  };
  const [r0, p0] = core();
  const [r1, p1] = entries();
  const [r2, p2] = baseline();
  const rel = (a: number, b: number): string => (Math.abs(a - b) / Math.abs(a)).toExponential(2);
  log(`INFO cell rms core=${r0} table=${r1} mathjs=${r2} rel_diff core/mathjs=${rel(r0, r2)}`);
  log(`INFO cell pp core=${p0} table=${p1} mathjs(8N samples)=${p2} rel_diff core/mathjs=${rel(p0, p2)}`);
  const t = pair(() => consume(entries()[0]), () => consume(baseline()[0]), { reps: 11 });
  log(`INFO cell through the table entries ours_ms=${t.oursMs.toFixed(3)} baseline_ms=${t.baselineMs.toFixed(3)} ratio=${t.ratio.toFixed(2)}`);
  const r = pair(() => consume(core()[0]), () => consume(baseline()[0]), { reps: 15 });
  log(`${benchLine('cell', r)}  (ours: the core)`);
}
