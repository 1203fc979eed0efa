/**
 * The add-in-only XML manifest, checked offline (the Office validator posts manifests to an online service):
 * well-formed, the elements Excel needs for custom functions in schema order, resource ids that resolve, and
 * every URL pointing at a file that the build puts into dist/.
 * Element names and order as in Microsoft's add-in manifest reference and the custom functions
 * manifest example (from memory).
 */
import * as fs from 'fs';
import * as path from 'path';
import { XMLParser, XMLValidator } from 'fast-xml-parser';
import { buildAddin, ROOT } from './support/excel-build';

/** preserveOrder output of fast-xml-parser: { tagName: children[], ':@'?: attributes }. */
type XNode = Record<string, unknown> & { ':@'?: Record<string, string> };

const tagOf = (n: XNode): string => Object.keys(n).find((k) => k !== ':@')!;
const kids = (n: XNode): XNode[] => (n[tagOf(n)] as XNode[]) ?? [];
const attr = (n: XNode, name: string): string | undefined => n[':@']?.[`@${name}`];
const text = (n: XNode): string => kids(n).map((k) => (k['#text'] as string | undefined) ?? '').join('').trim();

function child(n: XNode, tag: string): XNode {
  const c = kids(n).find((k) => tagOf(k) === tag);
  if (!c) throw new Error(`<${tagOf(n)}> has no <${tag}>`);
  return c;
}
const at = (n: XNode, ...tags: string[]): XNode => tags.reduce(child, n);

function walk(n: XNode, visit: (n: XNode) => void): void {
  visit(n);
  for (const k of kids(n)) if (typeof k === 'object' && tagOf(k) !== '#text') walk(k, visit);
}

const source = fs.readFileSync(path.join(ROOT, 'manifest.xml'), 'utf8');
let root: XNode;
let dist: string;

beforeAll(() => {
  dist = buildAddin().dist;
  const doc = new XMLParser({ ignoreAttributes: false, attributeNamePrefix: '@', preserveOrder: true }).parse(source) as XNode[];
  root = doc.find((n) => tagOf(n) === 'OfficeApp')!;
}, 180_000);

test('is well-formed XML with an OfficeApp task pane root', () => {
  expect(XMLValidator.validate(source)).toBe(true);
  expect(XMLValidator.validate(source.replace('</Hosts>', ''))).not.toBe(true); // the check can fail
  expect(root).toBeDefined();
  expect(attr(root, 'xmlns')).toBe('http://schemas.microsoft.com/office/appforoffice/1.1');
  expect(attr(root, 'xsi:type')).toBe('TaskPaneApp');
});

test('has the required top-level elements in schema order', () => {
  const order = [
    'Id', 'Version', 'ProviderName', 'DefaultLocale', 'DisplayName', 'Description', 'IconUrl',
    'HighResolutionIconUrl', 'SupportUrl', 'AppDomains', 'Hosts', 'Requirements', 'DefaultSettings',
    'Permissions', 'VersionOverrides',
  ];
  const present = kids(root).map(tagOf).filter((t) => t !== '#comment');
  const required = ['Id', 'Version', 'ProviderName', 'DefaultLocale', 'DisplayName', 'Description', 'IconUrl',
    'Hosts', 'Requirements', 'DefaultSettings', 'Permissions', 'VersionOverrides'];
  for (const r of required) expect(present).toContain(r);
  for (const t of present) expect(order).toContain(t);
  const positions = present.map((t) => order.indexOf(t));
  expect(positions).toEqual([...positions].sort((a, b) => a - b));

  expect(text(child(root, 'Id'))).toMatch(/^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/);
  const pkg = JSON.parse(fs.readFileSync(path.join(ROOT, 'package.json'), 'utf8')) as { version: string };
  expect(text(child(root, 'Version'))).toBe(`${pkg.version}.0`);
  expect(attr(child(root, 'DisplayName'), 'DefaultValue')!.length).toBeLessThanOrEqual(125);
  expect(attr(child(root, 'Description'), 'DefaultValue')!.length).toBeLessThanOrEqual(250);
  expect(['Restricted', 'ReadDocument']).toContain(text(child(root, 'Permissions')));
  expect(attr(at(root, 'Hosts', 'Host'), 'Name')).toBe('Workbook');
  const sets = kids(at(root, 'Requirements', 'Sets')).filter((n) => tagOf(n) === 'Set');
  expect(sets.map((s) => attr(s, 'Name'))).toContain('CustomFunctionsRuntime');
});

test('declares the custom functions extension point with resolvable resources and namespace HC', () => {
  const vo = child(root, 'VersionOverrides');
  expect(attr(vo, 'xsi:type')).toBe('VersionOverridesV1_0');
  const host = at(vo, 'Hosts', 'Host');
  expect(attr(host, 'xsi:type')).toBe('Workbook');
  const ep = at(host, 'AllFormFactors', 'ExtensionPoint');
  expect(attr(ep, 'xsi:type')).toBe('CustomFunctions');

  const resources = child(vo, 'Resources');
  const urls = new Map(kids(child(resources, 'bt:Urls')).map((u) => [attr(u, 'id'), attr(u, 'DefaultValue')]));
  const strings = new Map(kids(child(resources, 'bt:ShortStrings')).map((u) => [attr(u, 'id'), attr(u, 'DefaultValue')]));
  const resid = (tag: string): string => attr(at(ep, tag, 'SourceLocation'), 'resid')!;
  expect(urls.get(resid('Script'))).toBe('https://localhost:3000/functions.js');
  expect(urls.get(resid('Page'))).toBe('https://localhost:3000/functions.html');
  expect(urls.get(resid('Metadata'))).toBe('https://localhost:3000/functions.json');
  expect(strings.get(attr(child(ep, 'Namespace'), 'resid'))).toBe('HC');

  // every resid used anywhere is defined, and ids fit the 32-character limit
  walk(root, (n) => {
    const r = attr(n, 'resid');
    if (r !== undefined) {
      expect(urls.has(r) || strings.has(r)).toBe(true);
      expect(r.length).toBeLessThanOrEqual(32);
    }
  });
});

test('every URL points at a file of the build, served from https://localhost:3000', () => {
  const found: string[] = [];
  walk(root, (n) => {
    const v = attr(n, 'DefaultValue');
    if (v !== undefined && /^[a-z]+:\/\//i.test(v)) found.push(v);
  });
  expect(found.length).toBeGreaterThanOrEqual(7);
  for (const u of found) {
    const url = new URL(u);
    expect(url.origin).toBe('https://localhost:3000');
    const file = path.join(dist, decodeURIComponent(url.pathname));
    expect([u, fs.existsSync(file)]).toEqual([u, true]);
  }
  // the icons are PNGs of the sizes their elements announce
  const pngSize = (rel: string): number => fs.readFileSync(path.join(dist, rel)).readUInt32BE(16);
  expect(pngSize('assets/icon-32.png')).toBe(32);
  expect(pngSize('assets/icon-64.png')).toBe(64);
  expect(fs.readFileSync(path.join(dist, 'manifest.xml'), 'utf8')).toBe(source);
});
