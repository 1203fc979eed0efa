import { FUNCTION_BY_NAME } from '../src/functions/table';
import { invoke } from '../src/functions/invoke';
import { LADDER, LADDER_ROWS, sourceTable, source } from './fixtures';
import { spectrumFromTable, spectrumToTable } from '../src/core/spectrum';
import { response } from '../src/core/response';
import { rms } from '../src/core/measures';
import { parseLadder } from '../src/core/ladder';
const src = sourceTable(200);
const R = FUNCTION_BY_NAME.get('RESPONSE')!, M = FUNCTION_BY_NAME.get('RMS')!;
const vals = [[...LADDER.value]];
const S = source(200);
const what = process.argv[2];
const n = 20000;
let x = 0;
const run = () => {
  if (what === 'entry') { const r = invoke(R, [src, LADDER_ROWS, null, null, vals, null]); x += (invoke(M, [(r as any).value]) as any).value; }
  else if (what === 'from') x += spectrumFromTable(src).re[1];
  else if (what === 'to') x += spectrumToTable(S).length;
  else if (what === 'core') x += rms(response(S, LADDER, { values: LADDER.value }));
  else if (what === 'ladder') x += parseLadder(LADDER_ROWS).rows;
};
for (let i = 0; i < 3000; i++) run();
const t0 = performance.now();
for (let i = 0; i < n; i++) run();
console.log(what, ((performance.now() - t0) / n * 1000).toFixed(1), 'us');
