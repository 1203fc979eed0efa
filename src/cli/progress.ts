import { Io } from './io';

/**
 * A progress bar on stderr for long recalculations. HyperFormula evaluates synchronously and reports no
 * progress, so the bar counts HC function calls against the count of HC calls in the workbook's formulas
 * (they dominate the time). Drawn only when stderr is a terminal, and only once the work has taken
 * longer than `delayMs`, so short runs and piped output stay clean.
 */
export interface Progress {
  tick(): void;
  done(): void;
}

export function createProgress(io: Io, label: string, total: number, delayMs = 400, now = () => Date.now()): Progress {
  if (!io.errIsTTY || total <= 0) return { tick() {}, done() {} };
  const start = now();
  let count = 0;
  let lastDraw = 0;
  let drawn = false;
  const draw = (fraction: number): void => {
    const width = Math.max(10, Math.min(40, io.errColumns - label.length - 12));
    const filled = Math.round(fraction * width);
    io.err(`\r${label} [${'#'.repeat(filled)}${'.'.repeat(width - filled)}] ${Math.floor(fraction * 100)}%`);
    drawn = true;
  };
  return {
    tick() {
      count++;
      const t = now();
      if (t - start < delayMs || t - lastDraw < 100) return;
      lastDraw = t;
      // Calls can outnumber the formulas (spill sizing, re-reads): hold at 99 % until done.
      draw(Math.min(count / total, 0.99));
    },
    done() {
      // Erase the bar so the command's own output starts on a clean line.
      if (drawn) io.err('\r\x1b[2K');
    },
  };
}

/** HC function calls written in a set of formulas: the progress bar's expected total. */
export function countHcCalls(formulas: Iterable<string>): number {
  let n = 0;
  for (const f of formulas) n += (f.match(/\bHC\.[A-Z]+\s*\(/gi) ?? []).length;
  return n;
}
