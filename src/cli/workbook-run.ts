import * as fs from 'fs';
import { LoadedWorkbook, readWorkbook, recalculate, Recalculated } from '../engine/workbook';
import { countHcCalls, createProgress } from './progress';
import { Io, UsageError } from './io';

/** Read a workbook and recalculate it, with a progress bar on a terminal; file problems are usage errors. */
export async function loadAndRecalculate(file: string, io: Io): Promise<{ book: LoadedWorkbook } & Recalculated> {
  if (!fs.existsSync(file)) throw new UsageError(`no such file: ${file}`);
  if (!fs.statSync(file).isFile()) throw new UsageError(`not a file: ${file}`);
  let book: LoadedWorkbook;
  try {
    book = await readWorkbook(file);
  } catch (e) {
    throw new UsageError(`cannot read ${file} as an .xlsx workbook: ${(e as Error).message}`);
  }
  const progress = createProgress(io, 'recalculating', countHcCalls(book.formulas.map((f) => f.formula)));
  let result: Recalculated;
  try {
    result = recalculate(book, { onCall: () => progress.tick() });
  } finally {
    progress.done();
  }
  for (const w of book.warnings) io.err(`warning: ${w}\n`);
  return { book, ...result };
}
