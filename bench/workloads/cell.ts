/**
 * `cell`: one far-end response of the 6-element ladder at 200 harmonics plus its RMS and peak-to-peak,
 * through the function table entries (HC.RESPONSE → HC.RMS, HC.PKPK), exactly as one spreadsheet cell chain
 * calls them (tables in, tables out), against mathjs written the straightforward way (baseline-mathjs.ts).
 */
import { FUNCTION_BY_NAME } from '../../src/functions/table';
import { invoke } from '../../src/functions/invoke';
import { farEndPhasors, ppOf, rmsOf } from '../baseline-mathjs';
import { consume, LADDER, LADDER_ROWS, sourceTable } from '../fixtures';
import { benchLine, pair } from '../timing';

const HARMONICS = 200;

function call(name: string, ...args: unknown[]): unknown {
  const r = invoke(FUNCTION_BY_NAME.get(name)!, args);
  if (!r.ok) throw new Error(`HC.${name}: ${r.message}`);
  return r.value;
}

export function runCell(log: (s: string) => void): void {
  const src = sourceTable(HARMONICS);
  const ours = (): [number, number] => {
    const resp = call('RESPONSE', src, LADDER_ROWS);
    return [call('RMS', resp) as number, call('PKPK', resp) as number];
  };
  const baseline = (): [number, number] => {
    const v = farEndPhasors(src, LADDER);
    return [rmsOf(v), ppOf(v)];
  };
  const [r1, p1] = ours();
  const [r2, p2] = baseline();
  log(`INFO cell rms ours=${r1} mathjs=${r2} rel_diff=${(Math.abs(r1 - r2) / r1).toExponential(2)}`);
  log(`INFO cell pp ours=${p1} mathjs(8N samples)=${p2} rel_diff=${(Math.abs(p1 - p2) / p1).toExponential(2)}`);
  const r = pair(() => consume(ours()[0]), () => consume(baseline()[0]), { reps: 15 });
  log(benchLine('cell', r));
}
