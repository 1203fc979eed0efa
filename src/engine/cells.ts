/** A1-style cell addresses (0-based row/column inside the engine). */

export function columnName(col: number): string {
  let s = '';
  for (let c = col + 1; c > 0; c = Math.floor((c - 1) / 26)) s = String.fromCharCode(65 + ((c - 1) % 26)) + s;
  return s;
}

export const a1 = (row: number, col: number): string => `${columnName(col)}${row + 1}`;

/** Parse "B7" or "$B$7" into 0-based row/column; undefined if it is not a single cell address. */
export function parseA1(text: string): { row: number; col: number } | undefined {
  const m = /^\$?([A-Za-z]{1,3})\$?(\d{1,7})$/.exec(text.trim());
  if (!m) return undefined;
  let col = 0;
  for (const ch of m[1].toUpperCase()) col = col * 26 + (ch.charCodeAt(0) - 64);
  return { row: Number(m[2]) - 1, col: col - 1 };
}

/** Parse "A1:D51" (or a single cell) into its corners. */
export function parseRange(text: string): { top: number; left: number; bottom: number; right: number } | undefined {
  const [from, to = from] = text.split(':');
  const a = parseA1(from);
  const b = parseA1(to);
  if (!a || !b) return undefined;
  return {
    top: Math.min(a.row, b.row),
    left: Math.min(a.col, b.col),
    bottom: Math.max(a.row, b.row),
    right: Math.max(a.col, b.col),
  };
}

/** Sheet name as written in a reference: quoted when it is not a plain identifier. */
export function quoteSheet(name: string): string {
  return /^[A-Za-z_][A-Za-z0-9_.]*$/.test(name) && !parseA1(name) ? name : `'${name.replace(/'/g, "''")}'`;
}
