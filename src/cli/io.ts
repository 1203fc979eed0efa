/** Where a command writes: injectable so tests can run commands in-process. */
export interface Io {
  out(text: string): void;
  err(text: string): void;
  /** True when stderr is a terminal (progress bars are drawn only then). */
  errIsTTY: boolean;
  errColumns: number;
}

export const processIo: Io = {
  out: (text) => process.stdout.write(text),
  err: (text) => process.stderr.write(text),
  errIsTTY: Boolean(process.stderr.isTTY),
  errColumns: process.stderr.columns || 80,
};

/** A command-line mistake: reported with the command's usage, exit code 2. */
export class UsageError extends Error {}

/** Exit codes, documented in `hc --help`. */
export const EXIT = { ok: 0, checksFailed: 1, usage: 2, errorResult: 3 } as const;
