import { createEngine } from '../src/engine';
const hf = createEngine({ S: [
  ['=HC.PULSE(0, 12, 0.25, 1000, B10)', null, null, null, '=HC.RMS(A1:D11)', '=HC.PEAK(A1:D11)', '=HC.VALUE("4u7")', '=HC.MEAN(HC.PULSE(0,1,0.3,1000,20))'],
  [], [], [], [], [], [], [], [],
  [null, 10],
  [],
  ['=HC.TRACE(A1:D11, 5)'],
  [],[],[],[],[],
  ['=HC.COMBINE(HC.SINE(1,50),HC.SINE(0.2,150,90))'],
]});
console.log(hf.getSheetValues(0).slice(0, 20).map(r => JSON.stringify(r)).join('\n'));
console.log(hf.calculateFormula('=HC.PULSE(0,1,0.5,10,{1})', 0));
console.log(hf.calculateFormula('=HC.SAMPLED({0;1;0;-1}, 4, 2)', 0));
console.log(hf.calculateFormula('=HC.PWL({0;1E-6;4E-6;5E-6}, {0;2;2;0}, 3, 1E-5)', 0));
