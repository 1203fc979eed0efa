/**
 * Writes the README's function reference from the function table, between the markers
 * <!-- functions:begin --> and <!-- functions:end -->. `--check` exits 1 when the README is out of date
 * (test/reference-docs.test.ts runs the same comparison).
 */
import * as fs from 'fs';
import * as path from 'path';
import { FUNCTIONS } from '../src/functions/table';
import { FunctionSpec } from '../src/functions/spec';

const BEGIN = '<!-- functions:begin -->';
const END = '<!-- functions:end -->';

function signature(f: FunctionSpec): string {
  const parts = f.args.map((a) => (a.repeating ? `${a.name}1, [${a.name}2], …` : a.optional ? `[${a.name}]` : a.name));
  return `HC.${f.name}(${parts.join(', ')})`;
}

export function renderReference(): string {
  const out: string[] = [];
  for (const f of FUNCTIONS) {
    out.push(`#### \`${signature(f)}\``, '', f.description, '');
    for (const a of f.args) out.push(`- \`${a.name}\`${a.optional ? ' (optional)' : ''}: ${a.help}`);
    out.push('', `Example: \`${f.example}\``, '');
  }
  return out.join('\n');
}

export function updatedReadme(readme: string): string {
  const i = readme.indexOf(BEGIN);
  const j = readme.indexOf(END);
  if (i < 0 || j < i) throw new Error(`README.md lacks the markers ${BEGIN} … ${END}`);
  return `${readme.slice(0, i + BEGIN.length)}\n\n${renderReference()}\n${readme.slice(j)}`;
}

if (require.main === module) {
  const file = path.join(__dirname, '..', 'README.md');
  const before = fs.readFileSync(file, 'utf8');
  const after = updatedReadme(before);
  if (process.argv.includes('--check')) {
    if (after !== before) {
      console.error('README.md function reference is out of date: run npm run docs');
      process.exit(1);
    }
  } else if (after !== before) {
    fs.writeFileSync(file, after);
    console.log('README.md function reference updated');
  }
}
