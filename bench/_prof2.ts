import { LADDER, source } from './fixtures';
import { response } from '../src/core/response';
import { rms } from '../src/core/measures';
import { pp } from '../src/core/extremes';
const S = source(200);
const resp = response(S, LADDER);
const which = process.argv[2];
const t0 = performance.now();
let x = 0;
for (let i = 0; i < +(process.argv[3] || 20000); i++) {
  if (which === 'rms') x += rms(resp);
  else if (which === 'resp') x += response(S, LADDER).re[3];
  else x += pp(resp);
}
console.log(which, ((performance.now() - t0) / +(process.argv[3] || 20000) * 1000).toFixed(2), 'us');
