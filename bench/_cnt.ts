import { LADDER, source } from './fixtures';
import { response } from '../src/core/response';
import { pp, extremes } from '../src/core/extremes';
const S = source(200);
const resp = response(S, LADDER);
console.log(extremes(resp), (globalThis as any).__cand, (globalThis as any).__ref);
