import * as fs from 'fs';
import * as zlib from 'zlib';

/**
 * A look inside an .xlsx file before the workbook reader (exceljs) sees it. exceljs inflates every part of
 * the zip into memory and expands merged ranges and data-validation ranges cell by cell, so a hostile file
 * of a few kilobytes can take minutes and gigabytes: a zip bomb (a sheet that inflates to hundreds of MB),
 * a part whose directory record understates its size, `<mergeCell ref="A1:XFD1048576"/>`.
 *
 * This reads the zip's central directory with Buffer and zlib only, checks the counts and sizes against
 * XLSX_LIMITS, inflates every part with an output cap equal to its declared size (so a lying record is
 * caught as soon as it is exceeded), and scans the worksheet XML for its cell count and for the areas of
 * merged and validated ranges. It returns the file's bytes for the reader, so the file is read once.
 */

export const XLSX_LIMITS = {
  fileBytes: 64 * 1024 * 1024,          // the .xlsx file itself
  entries: 10_000,                      // parts in the zip
  totalBytes: 64 * 1024 * 1024,         // all parts inflated together
  ratio: 200,                           // inflated ÷ compressed size of a part above ratioFloor bytes
  ratioFloor: 1024 * 1024,
  cells: 500_000,                       // <c> elements in all worksheets
  mergedCells: 100_000,                 // cells covered by merged ranges, all sheets
  validatedCells: 100_000,              // cells covered by data-validation ranges, all sheets
  sheetArea: 10_000_000,                // A1 to the last row and column with a value, all sheets (workbook.ts)
} as const;

/** A file that is not a workbook hc can read safely; the message says why. */
export class XlsxRefused extends Error {}

const EOCD = 0x06054b50;
const CENTRAL = 0x02014b50;
const LOCAL = 0x04034b50;
const MB = (n: number): string => `${(n / (1024 * 1024)).toFixed(n < 1024 * 1024 ? 2 : 0)} MB`;

interface Entry {
  name: string;
  method: number;
  flags: number;
  compressed: number;
  size: number;
  localOffset: number;
}

/** Read and check an .xlsx file; returns its bytes. Throws XlsxRefused with a reason. */
export function readXlsxGuarded(file: string): Buffer {
  const stat = fs.statSync(file);
  if (stat.size > XLSX_LIMITS.fileBytes) {
    throw new XlsxRefused(`the file is ${MB(stat.size)}; hc reads workbooks of at most ${MB(XLSX_LIMITS.fileBytes)}.`);
  }
  const buf = fs.readFileSync(file);
  checkXlsxBuffer(buf);
  return buf;
}

/** The checks of readXlsxGuarded on bytes already read. */
export function checkXlsxBuffer(buf: Buffer): void {
  if (buf.length >= 8 && buf.readUInt32BE(0) === 0xd0cf11e0 && buf.readUInt32BE(4) === 0xa1b11ae1) {
    throw new XlsxRefused(
      'this is an old binary (.xls) or a password-protected workbook, not an .xlsx (Office Open XML) file; save it as .xlsx without a password.',
    );
  }
  if (buf.length < 4 || buf.readUInt32LE(0) !== LOCAL) {
    throw new XlsxRefused('this is not an .xlsx workbook: an .xlsx file is a zip archive, and this file does not start like one.');
  }
  const entries = centralDirectory(buf);
  let total = 0;
  let cells = 0;
  let merged = 0;
  let validated = 0;
  for (const e of entries) {
    if (e.flags & 1) throw new XlsxRefused(`part ${e.name} is encrypted; hc reads unencrypted workbooks only.`);
    if (e.method !== 0 && e.method !== 8) throw new XlsxRefused(`part ${e.name} uses compression method ${e.method}; an .xlsx uses deflate (8) or none (0).`);
    total += e.size;
    if (total > XLSX_LIMITS.totalBytes) {
      throw new XlsxRefused(
        `the workbook's parts inflate to more than ${MB(XLSX_LIMITS.totalBytes)} (at ${e.name}); hc refuses it as too large, or as a zip bomb.`,
      );
    }
    if (e.size > XLSX_LIMITS.ratioFloor && e.size > XLSX_LIMITS.ratio * Math.max(1, e.compressed)) {
      throw new XlsxRefused(
        `part ${e.name} inflates ${Math.round(e.size / Math.max(1, e.compressed))} times (${MB(e.compressed)} to ${MB(e.size)}); ` +
          `more than ${XLSX_LIMITS.ratio} times is taken for a zip bomb.`,
      );
    }
    const data = inflate(buf, e);
    if (/^xl\/worksheets\/[^/]+\.xml$/i.test(e.name)) {
      const xml = data.toString('latin1'); // ASCII markup is all the scan reads
      cells += count(xml, /<(?:\w+:)?c[\s>/]/g);
      merged += areas(xml, /<(?:\w+:)?mergeCell\s[^>]*?\bref="([^"]*)"/g);
      validated += areas(xml, /<(?:\w+:)?dataValidation\s[^>]*?\bsqref="([^"]*)"/g);
      if (cells > XLSX_LIMITS.cells) {
        throw new XlsxRefused(`the workbook has more than ${XLSX_LIMITS.cells.toLocaleString('en-US')} cells (at ${e.name}); hc reads smaller workbooks.`);
      }
      if (merged > XLSX_LIMITS.mergedCells) {
        throw new XlsxRefused(
          `merged ranges in ${e.name} cover more than ${XLSX_LIMITS.mergedCells.toLocaleString('en-US')} cells; unmerge them (the reader visits every merged cell).`,
        );
      }
      if (validated > XLSX_LIMITS.validatedCells) {
        throw new XlsxRefused(
          `data-validation ranges in ${e.name} cover more than ${XLSX_LIMITS.validatedCells.toLocaleString('en-US')} cells; limit them to the cells in use.`,
        );
      }
    }
  }
}

function centralDirectory(buf: Buffer): Entry[] {
  // The end-of-central-directory record: 22 bytes plus a comment of up to 65 535, at the very end.
  let eocd = -1;
  for (let i = buf.length - 22; i >= Math.max(0, buf.length - 22 - 65535); i--) {
    if (buf.readUInt32LE(i) === EOCD) {
      eocd = i;
      break;
    }
  }
  if (eocd < 0) throw new XlsxRefused('the zip archive has no central directory: the file is truncated or damaged.');
  const count = buf.readUInt16LE(eocd + 10);
  const size = buf.readUInt32LE(eocd + 12);
  const offset = buf.readUInt32LE(eocd + 16);
  if (count === 0xffff || size === 0xffffffff || offset === 0xffffffff) {
    throw new XlsxRefused('the workbook is a ZIP64 archive (over 4 GB or 65 535 parts); hc reads smaller workbooks.');
  }
  if (count > XLSX_LIMITS.entries) throw new XlsxRefused(`the zip holds ${count} parts; an .xlsx hc reads has at most ${XLSX_LIMITS.entries}.`);
  if (offset + size > eocd) throw new XlsxRefused('the zip directory points outside the file: the file is truncated or damaged.');
  const entries: Entry[] = [];
  let p = offset;
  for (let k = 0; k < count; k++) {
    if (p + 46 > eocd || buf.readUInt32LE(p) !== CENTRAL) {
      throw new XlsxRefused('the zip directory is damaged (a record is missing or cut short).');
    }
    const nameLength = buf.readUInt16LE(p + 28);
    const extraLength = buf.readUInt16LE(p + 30);
    const commentLength = buf.readUInt16LE(p + 32);
    const e: Entry = {
      flags: buf.readUInt16LE(p + 8),
      method: buf.readUInt16LE(p + 10),
      compressed: buf.readUInt32LE(p + 20),
      size: buf.readUInt32LE(p + 24),
      localOffset: buf.readUInt32LE(p + 42),
      name: buf.toString('utf8', p + 46, Math.min(eocd, p + 46 + nameLength)),
    };
    if (e.compressed === 0xffffffff || e.size === 0xffffffff || e.localOffset === 0xffffffff) {
      throw new XlsxRefused(`part ${e.name} needs ZIP64 sizes (over 4 GB); hc reads smaller workbooks.`);
    }
    entries.push(e);
    p += 46 + nameLength + extraLength + commentLength;
  }
  return entries;
}

/** A part's bytes, inflated with an output cap of its declared size (a larger stream is refused). */
function inflate(buf: Buffer, e: Entry): Buffer {
  const at = e.localOffset;
  if (at + 30 > buf.length || buf.readUInt32LE(at) !== LOCAL) {
    throw new XlsxRefused(`part ${e.name} is missing from the file: the file is truncated or damaged.`);
  }
  const start = at + 30 + buf.readUInt16LE(at + 26) + buf.readUInt16LE(at + 28);
  const end = start + e.compressed;
  if (end > buf.length) throw new XlsxRefused(`part ${e.name} is cut short: the file is truncated.`);
  const raw = buf.subarray(start, end);
  if (e.method === 0) {
    if (e.compressed !== e.size) throw new XlsxRefused(`part ${e.name} is stored with inconsistent sizes: the file is damaged.`);
    return raw;
  }
  let out: Buffer;
  try {
    out = zlib.inflateRawSync(raw, { maxOutputLength: Math.max(1, e.size) });
  } catch (err) {
    const code = (err as { code?: string }).code;
    if (code === 'ERR_BUFFER_TOO_LARGE' || err instanceof RangeError) {
      throw new XlsxRefused(`part ${e.name} inflates beyond the ${e.size} bytes its directory record declares: a damaged file or a zip bomb.`);
    }
    throw new XlsxRefused(`part ${e.name} cannot be inflated (${(err as Error).message}): the file is truncated or damaged.`);
  }
  if (out.length !== e.size) {
    throw new XlsxRefused(`part ${e.name} inflates to ${out.length} bytes, not the ${e.size} its directory record declares: the file is damaged.`);
  }
  return out;
}

function count(text: string, re: RegExp): number {
  let n = 0;
  re.lastIndex = 0;
  while (re.exec(text)) n++;
  return n;
}

/** Sum of the areas of the ranges in matching attributes ("A1:B2 D4", whole rows and columns included). */
function areas(text: string, re: RegExp): number {
  let total = 0;
  re.lastIndex = 0;
  for (let m = re.exec(text); m; m = re.exec(text)) {
    for (const part of m[1].trim().split(/\s+/)) if (part) total += rangeArea(part);
  }
  return total;
}

/** Cells in "A1", "A1:C3", "A:C" or "2:5" ($ signs allowed); a form that cannot be read counts as the whole sheet. */
export function rangeArea(ref: string): number {
  const corners = ref.replace(/\$/g, '').split(':');
  if (corners.length > 2) return 1048576 * 16384;
  const read = (t: string): { col?: number; row?: number } | undefined => {
    const m = /^([A-Za-z]{0,3})(\d{0,7})$/.exec(t);
    if (!m || (m[1] === '' && m[2] === '')) return undefined;
    let col: number | undefined;
    if (m[1]) {
      col = 0;
      for (const ch of m[1].toUpperCase()) col = col * 26 + (ch.charCodeAt(0) - 64);
    }
    return { col, row: m[2] ? Number(m[2]) : undefined };
  };
  const a = read(corners[0]);
  const b = read(corners[1] ?? corners[0]);
  if (!a || !b) return 1048576 * 16384;
  const cols = a.col !== undefined && b.col !== undefined ? Math.abs(b.col - a.col) + 1 : 16384;
  const rows = a.row !== undefined && b.row !== undefined ? Math.abs(b.row - a.row) + 1 : 1048576;
  return cols * rows;
}
