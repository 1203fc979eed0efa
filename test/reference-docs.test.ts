import * as fs from 'fs';
import * as path from 'path';
import { updatedReadme } from '../scripts/generate-reference';
import { FUNCTIONS } from '../src/functions/table';

const readme = fs.readFileSync(path.join(__dirname, '..', 'README.md'), 'utf8');

describe('README function reference', () => {
  test('is generated from the current function table (run `npm run docs` after changing the table)', () => {
    expect(updatedReadme(readme)).toBe(readme);
  });

  // Excel requires function names of at least three characters (Office custom-functions naming rules), so
  // DESIGN §3's AT and PP are published as ATTIME and PKPK.
  test('names every DESIGN §3 function', () => {
    const design = [
      'PULSE', 'RAMP', 'RECTIFIED', 'PWL', 'SAMPLED', 'SINE', 'COMBINE', 'IMPEDANCE', 'TRANSFER', 'RESPONSE', 'STRESS',
      'MEAN', 'RMS', 'PEAK', 'VALLEY', 'PKPK', 'CREST', 'THD', 'ATTIME', 'TRACE', 'POWER', 'SPREAD', 'VALUE', 'PREFERRED', 'ENG',
    ];
    const names = FUNCTIONS.map((f) => f.name);
    expect([...names].sort()).toEqual([...design].sort());
    for (const n of design) expect(readme).toContain(`HC.${n}(`);
    for (const n of names) expect(n.length).toBeGreaterThanOrEqual(3);
  });

  test('opens with the job paragraph and the two set-up commands', () => {
    const head = readme.split('\n').slice(0, 30).join('\n');
    expect(head).toContain('npm install && npm start');
    expect(head).toContain('npm test');
  });
});
