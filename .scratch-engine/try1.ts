import { HyperFormula } from 'hyperformula';
import { buildPlugin } from '../src/engine/plugin';
import { newContext, parseAddressKey } from '../src/engine/context';
import { FunctionSpec } from '../src/functions/spec';
import { asInteger, asNumber, asGrid } from '../src/functions/coerce';
import { pulse } from '../src/core/waveforms';
import { spectrumToTable, spectrumFromTable } from '../src/core/spectrum';

const specs: FunctionSpec[] = [
  { name: 'PULSE', description: '', result: 'matrix', example: '', args: [
    { name: 'low', kind: 'number', help: '' }, { name: 'high', kind: 'number', help: '' }, { name: 'duty', kind: 'number', help: '' },
    { name: 'frequency', kind: 'number', help: '' }, { name: 'harmonics', kind: 'integer', help: '' },
    { name: 'rise', kind: 'number', help: '', optional: true }],
    impl: (lo, hi, d, f, n, r) => spectrumToTable(pulse(asNumber(lo,'low'), asNumber(hi,'high'), asNumber(d,'duty'), asNumber(f,'frequency'), asInteger(n,'harmonics'), asNumber(r,'rise',0), 0, 0)) },
  { name: 'MEANX', description: '', result: 'number', example: '', args: [{ name: 'spectrum', kind: 'range', help: '' }],
    impl: (s) => spectrumFromTable(asGrid(s, 'spectrum')).re[0] },
  { name: 'TWICE', description: '', result: 'number', example: '', args: [{ name: 'x', kind: 'number', help: '' }],
    impl: (x) => 2 * asNumber(x, 'x') },
];
const { plugin, translations } = buildPlugin(specs);
HyperFormula.registerFunctionPlugin(plugin, translations);
const ctx = newContext();
ctx.building = true;
const hf = HyperFormula.buildFromSheets({ S: [
  ['=HC.PULSE(0, 12, 0.25, 1000, 3)', null, null, null, 5, '=E1+1', '=HC.MEANX(A1:D4)', '=HC.TWICE("4k7")', '=HC.TWICE(E1:E3)', '=0.1+0.2'],
  [],[],[],[],[],
  ['=HC.PULSE(0, 12, 0.25, 1000, E1)'],
  [],[],[],[],[],[],[],[],
  ['=HC.PULSE(0, 12, 0.25, 1000, F1)'],
  [],[],[],[],[],[],[],[],
  ['=HC.PULSE(0, 12, 0.25, 1000, -1)', '=HC.PULSE(0, 12, 0.25, 1000, 1/0)', '=HC.MEANX({0,0,3,0;1,1000,1,0})', '=HC.TWICE()', '=HC.TWICE(1,2)'],
]}, { licenseKey: 'gpl-v3', smartRounding: false, useArrayArithmetic: true, context: ctx });
ctx.building = false;
console.log('pending', [...ctx.pending]);
const show = () => { for (const r of [0,1,2,3,4,6,7,11,12,16,17,22,24]) console.log(r, JSON.stringify(hf.getSheetValues(0)[r])); };
show();
for (const k of ctx.pending.keys()) { const a = parseAddressKey(k); ctx.pending.delete(k); hf.setCellContents(a, [[hf.getCellFormula(a)!]]); }
console.log('after settle, pending', [...ctx.pending]);
show();
hf.setCellContents({sheet:0,row:0,col:4}, [[7]]);
console.log('after E1=7 pending', [...ctx.pending]); show();
console.log(hf.calculateFormula('=HC.PULSE(0,1,0.5,10,2)', 0));
console.log(hf.calculateFormula('=hc.twice(3)', 0));
