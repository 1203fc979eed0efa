/**
 * Hand-made .xlsx files for the hostile-file tests: a minimal workbook (one sheet whose XML the test
 * writes) zipped by a small writer that can also misstate a part's size, so zip bombs, lying directory
 * records and truncated archives can be built without any zip package. Common practice, no source.
 */
import * as zlib from 'zlib';

const CRC_TABLE = (() => {
  const t = new Uint32Array(256);
  for (let n = 0; n < 256; n++) {
    let c = n;
    for (let k = 0; k < 8; k++) c = c & 1 ? 0xedb88320 ^ (c >>> 1) : c >>> 1;
    t[n] = c >>> 0;
  }
  return t;
})();

export function crc32(buf: Buffer): number {
  let c = 0xffffffff;
  for (let i = 0; i < buf.length; i++) c = CRC_TABLE[(c ^ buf[i]) & 0xff] ^ (c >>> 8);
  return (c ^ 0xffffffff) >>> 0;
}

export interface Part {
  name: string;
  /** The part's content; or give `deflated` (already compressed) with `size` and `crc`. */
  data?: Buffer | string;
  deflated?: Buffer;
  size?: number;
  crc?: number;
  /** Write this as the inflated size in the zip records instead of the true one (a lying record). */
  declaredSize?: number;
}

/** A zip archive of the parts, deflated, with local headers, a central directory and its end record. */
export function zip(parts: Part[]): Buffer {
  const locals: Buffer[] = [];
  const centrals: Buffer[] = [];
  let offset = 0;
  for (const p of parts) {
    const name = Buffer.from(p.name, 'utf8');
    let raw: Buffer | undefined;
    if (p.data !== undefined) raw = Buffer.isBuffer(p.data) ? p.data : Buffer.from(p.data, 'utf8');
    const body = p.deflated ?? zlib.deflateRawSync(raw as Buffer);
    const size = p.declaredSize ?? p.size ?? (raw as Buffer).length;
    const crc = p.crc ?? (raw ? crc32(raw) : 0);
    const local = Buffer.alloc(30);
    local.writeUInt32LE(0x04034b50, 0);
    local.writeUInt16LE(20, 4);
    local.writeUInt16LE(0, 6);
    local.writeUInt16LE(8, 8);
    local.writeUInt32LE(crc, 14);
    local.writeUInt32LE(body.length, 18);
    local.writeUInt32LE(size, 22);
    local.writeUInt16LE(name.length, 26);
    const central = Buffer.alloc(46);
    central.writeUInt32LE(0x02014b50, 0);
    central.writeUInt16LE(20, 4);
    central.writeUInt16LE(20, 6);
    central.writeUInt16LE(0, 8);
    central.writeUInt16LE(8, 10);
    central.writeUInt32LE(crc, 16);
    central.writeUInt32LE(body.length, 20);
    central.writeUInt32LE(size, 24);
    central.writeUInt16LE(name.length, 28);
    central.writeUInt32LE(offset, 42);
    locals.push(local, name, body);
    centrals.push(central, name);
    offset += local.length + name.length + body.length;
  }
  const dir = Buffer.concat(centrals);
  const end = Buffer.alloc(22);
  end.writeUInt32LE(0x06054b50, 0);
  end.writeUInt16LE(parts.length, 8);
  end.writeUInt16LE(parts.length, 10);
  end.writeUInt32LE(dir.length, 12);
  end.writeUInt32LE(offset, 16);
  return Buffer.concat([...locals, dir, end]);
}

const NS = 'http://schemas.openxmlformats.org/spreadsheetml/2006/main';
const REL = 'http://schemas.openxmlformats.org/officeDocument/2006/relationships';

/** `<row>` elements for cells given as [address, number | formula text starting with "="]. */
export function rows(cells: [string, number | string][]): string {
  const byRow = new Map<number, string[]>();
  for (const [ref, v] of cells) {
    const r = Number(/\d+$/.exec(ref)![0]);
    const c =
      typeof v === 'number'
        ? `<c r="${ref}"><v>${v}</v></c>`
        : `<c r="${ref}"><f>${v.slice(1).replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/"/g, '&quot;')}</f></c>`;
    byRow.set(r, [...(byRow.get(r) ?? []), c]);
  }
  return [...byRow].sort((a, b) => a[0] - b[0]).map(([r, cs]) => `<row r="${r}">${cs.join('')}</row>`).join('');
}

/** A worksheet's XML: sheet data plus optional elements after it (mergeCells, dataValidations) and a dimension. */
export function sheetXml(data: string, opts: { dimension?: string; after?: string } = {}): string {
  return (
    `<?xml version="1.0" encoding="UTF-8" standalone="yes"?>\n<worksheet xmlns="${NS}" xmlns:r="${REL}">` +
    (opts.dimension ? `<dimension ref="${opts.dimension}"/>` : '') +
    `<sheetData>${data}</sheetData>${opts.after ?? ''}</worksheet>`
  );
}

/** The parts of a one-sheet workbook around the given sheet part (its data or a prebuilt Part). */
export function workbookParts(sheet: string | Part): Part[] {
  const sheetPart: Part = typeof sheet === 'string' ? { name: 'xl/worksheets/sheet1.xml', data: sheet } : sheet;
  return [
    {
      name: '[Content_Types].xml',
      data:
        '<?xml version="1.0" encoding="UTF-8" standalone="yes"?>\n<Types xmlns="http://schemas.openxmlformats.org/package/2006/content-types">' +
        '<Default Extension="rels" ContentType="application/vnd.openxmlformats-package.relationships+xml"/>' +
        '<Default Extension="xml" ContentType="application/xml"/>' +
        '<Override PartName="/xl/workbook.xml" ContentType="application/vnd.openxmlformats-officedocument.spreadsheetml.sheet.main+xml"/>' +
        '<Override PartName="/xl/worksheets/sheet1.xml" ContentType="application/vnd.openxmlformats-officedocument.spreadsheetml.worksheet+xml"/>' +
        '</Types>',
    },
    {
      name: '_rels/.rels',
      data:
        '<?xml version="1.0" encoding="UTF-8" standalone="yes"?>\n<Relationships xmlns="http://schemas.openxmlformats.org/package/2006/relationships">' +
        `<Relationship Id="rId1" Type="${REL}/officeDocument" Target="xl/workbook.xml"/></Relationships>`,
    },
    {
      name: 'xl/workbook.xml',
      data: `<?xml version="1.0" encoding="UTF-8" standalone="yes"?>\n<workbook xmlns="${NS}" xmlns:r="${REL}"><sheets><sheet name="Calc" sheetId="1" r:id="rId1"/></sheets></workbook>`,
    },
    {
      name: 'xl/_rels/workbook.xml.rels',
      data:
        '<?xml version="1.0" encoding="UTF-8" standalone="yes"?>\n<Relationships xmlns="http://schemas.openxmlformats.org/package/2006/relationships">' +
        `<Relationship Id="rId1" Type="${REL}/worksheet" Target="worksheets/sheet1.xml"/></Relationships>`,
    },
    sheetPart,
  ];
}

/**
 * Raw deflate of `prefix`, then `fill` repeated `times`, then `suffix`, streamed (never held inflated). The CRC
 * is left 0 (the readers tested here refuse such a part before any CRC would be checked).
 */
export function deflateRepeated(prefix: string, fill: Buffer, times: number, suffix: string): Promise<{ deflated: Buffer; size: number; crc: number }> {
  return new Promise((resolve, reject) => {
    const d = zlib.createDeflateRaw({ level: 9 });
    const out: Buffer[] = [];
    d.on('data', (c: Buffer) => out.push(c));
    d.on('error', reject);
    d.on('end', () => resolve({ deflated: Buffer.concat(out), size, crc: 0 }));
    let size = 0;
    const put = (b: Buffer): void => {
      size += b.length;
      d.write(b);
    };
    put(Buffer.from(prefix));
    for (let k = 0; k < times; k++) put(fill);
    put(Buffer.from(suffix));
    d.end();
  });
}
