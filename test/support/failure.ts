import { HcError } from '../../src/core/errors';

/** What f throws: an HcError's code and message, 'foreign …' for any other exception, or 'none'. */
export function failure(f: () => unknown): { code: string; message: string } {
  try {
    f();
  } catch (e) {
    if (e instanceof HcError) return { code: e.code, message: e.message };
    return { code: `foreign ${String(e)}`, message: '' };
  }
  return { code: 'none', message: '' };
}

/** The HcError code thrown by f, or 'none'. */
export const codeOf = (f: () => unknown): string => failure(f).code;

/** The message of whatever f throws ('' when it does not throw). */
export function messageOf(f: () => unknown): string {
  try {
    f();
  } catch (e) {
    return (e as Error).message;
  }
  return '';
}
