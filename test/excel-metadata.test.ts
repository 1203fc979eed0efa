/**
 * functions.json (made by custom-functions-metadata from the generated JSDoc) and help.html agree with the
 * function table: descriptions, per-argument help, optional and repeating arguments, matrix shapes, help links.
 * Metadata field names as in Microsoft's custom functions JSON metadata reference (from memory).
 */
import * as fs from 'fs';
import * as path from 'path';
import { FUNCTIONS, FUNCTION_BY_NAME } from '../src/functions/table';
import { signature } from '../src/functions/help-page';
import { buildAddin } from './support/excel-build';

interface MetaParam {
  name: string;
  description?: string;
  type?: string;
  dimensionality?: string;
  optional?: boolean;
  repeating?: boolean;
}
interface MetaFunction {
  id: string;
  name: string;
  description?: string;
  helpUrl?: string;
  parameters: MetaParam[];
  result: { type?: string; dimensionality?: string };
}

let meta: MetaFunction[];
let help: string;

beforeAll(() => {
  const { dist } = buildAddin();
  meta = (JSON.parse(fs.readFileSync(path.join(dist, 'functions.json'), 'utf8')) as { functions: MetaFunction[] }).functions;
  help = fs.readFileSync(path.join(dist, 'help.html'), 'utf8');
}, 180_000);

test('one entry per table function, id = name = the upper-case table name', () => {
  expect(meta.map((f) => f.id)).toEqual(FUNCTIONS.map((f) => f.name));
  for (const f of meta) {
    expect(f.name).toBe(f.id);
    expect(f.id).toMatch(/^[A-Z][A-Z0-9_.]*$/);
  }
});

test('every function has its description and every parameter its help, in table order', () => {
  for (const f of meta) {
    const spec = FUNCTION_BY_NAME.get(f.id)!;
    expect(f.description).toBe(spec.description.replace(/\s+/g, ' ').trim());
    expect(f.parameters.map((p) => p.name)).toEqual(spec.args.map((a) => a.name));
    f.parameters.forEach((p, k) => {
      expect(p.description).toBe(spec.args[k].help.replace(/\s+/g, ' ').trim());
      expect(p.description!.length).toBeLessThanOrEqual(512);
    });
  }
});

test('optional and repeating arguments are marked, ranges and spilled results are matrices', () => {
  for (const f of meta) {
    const spec = FUNCTION_BY_NAME.get(f.id)!;
    f.parameters.forEach((p, k) => {
      const a = spec.args[k];
      expect([f.id, p.name, p.optional === true]).toEqual([f.id, a.name, a.optional === true]);
      expect([f.id, p.name, p.repeating === true]).toEqual([f.id, a.name, a.repeating === true]);
      expect([f.id, p.name, p.dimensionality ?? 'scalar']).toEqual([f.id, a.name, a.kind === 'range' ? 'matrix' : 'scalar']);
      // scalars stay `any` so engineering text (4k7, 250 kHz) reaches our coercion rather than Excel's
      expect(p.type ?? 'any').toBe('any');
    });
    expect([f.id, f.result.dimensionality ?? 'scalar']).toEqual([f.id, spec.result === 'matrix' ? 'matrix' : 'scalar']);
  }
  const combine = meta.find((f) => f.id === 'COMBINE')!;
  expect(combine.parameters[0]).toMatchObject({ repeating: true, dimensionality: 'matrix' });
  const pulse = meta.find((f) => f.id === 'PULSE')!;
  expect(pulse.parameters.filter((p) => p.optional).map((p) => p.name)).toEqual(['rise', 'fall', 'delay']);
  expect(pulse.result.dimensionality).toBe('matrix');
});

test('each help link points at a section of help.html that documents the function', () => {
  for (const f of meta) {
    const spec = FUNCTION_BY_NAME.get(f.id)!;
    expect(f.helpUrl).toBe(`https://localhost:3000/help.html#${f.id}`);
    const start = help.indexOf(`<section id="${f.id}">`);
    expect(start).toBeGreaterThanOrEqual(0);
    const sectionHtml = help.slice(start, help.indexOf('</section>', start));
    expect(sectionHtml).toContain(signature(spec));
    for (const a of spec.args) expect(sectionHtml).toContain(`<code>${a.name}</code>`);
    expect(sectionHtml).toContain('Example: <code class="example">');
  }
  expect(signature(FUNCTION_BY_NAME.get('PULSE')!)).toBe('HC.PULSE(low, high, duty, frequency, harmonics, [rise], [fall], [delay])');
  expect(signature(FUNCTION_BY_NAME.get('COMBINE')!)).toBe('HC.COMBINE(spectrum1, [spectrum2], …)');
});

test('the help page carries no script and a restrictive Content-Security-Policy', () => {
  expect(help).not.toMatch(/<script/i);
  expect(help).toMatch(/Content-Security-Policy[^>]*default-src 'none'/);
});
