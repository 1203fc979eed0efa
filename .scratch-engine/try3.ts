import { createEngine } from '../src/engine';
const hf = createEngine({ S: [
  ['=HC.PULSE(0, 12, 0.25, 1000, F1)', null, null, null, null, 10, '=HC.RMS(A1:D11)', '=HC.PEAK(A1:D11)', '=HC.VALUE("4u7")', '=_xldudf_HC.MEAN(_xldudf_HC.PULSE(0,1,0.3,1000,20))', '=1E-6'],
  [], [], [], [], [], [], [], [], [], [], 
  ['=HC.TRACE(A1:D11, 5)', null, '=HC.TRACE(HC.RESPONSE(A1:D11, A20:C22), 3)'],
  [],[],[],[],[],
  ['=HC.COMBINE(HC.SINE(1,50),HC.SINE(0.2,150,90))'],
  ['series', 'L', '10u'], ['shunt', 'C', '22u'], ['+','R','3m'],
]});
console.log(hf.getSheetValues(0).slice(0, 24).map(r => JSON.stringify(r)).join('\n'));
