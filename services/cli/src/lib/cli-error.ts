import type { ErrorDetail } from '@localis/shared';

/**
 * Exit codes are part of the CLI's interface: batch scripts on the cluster branch on them, e.g. to
 * stop a job array when the token has expired rather than retrying a hundred times.
 */
export const EXIT = {
  ok: 0,
  failed: 1,
  usage: 2,
  notSignedIn: 3,
  /** What shells report for Ctrl-C, so `localis` reads like any other interrupted program. */
  interrupted: 130,
} as const;
export type ExitCode = (typeof EXIT)[keyof typeof EXIT];

/** An error meant for the person at the terminal: its message is shown as is, without a stack. */
export class CliError extends Error {
  readonly exitCode: ExitCode;
  readonly details: ErrorDetail[];
  /** What to try next, printed on its own line after the message. */
  readonly hint?: string;

  constructor(message: string, opts: { exitCode?: ExitCode; details?: ErrorDetail[]; hint?: string; cause?: unknown } = {}) {
    super(message, opts.cause === undefined ? undefined : { cause: opts.cause });
    this.name = 'CliError';
    this.exitCode = opts.exitCode ?? EXIT.failed;
    this.details = opts.details ?? [];
    this.hint = opts.hint;
  }
}

export function isCliError(value: unknown): value is CliError {
  return value instanceof CliError;
}

/** A zod path as a reader writes it: `sizes[2].L`, or `(request)` when the whole input is meant. */
export function formatPath(path: ErrorDetail['path']): string {
  if (path.length === 0) return '(request)';
  return path
    .map((part, i) => (typeof part === 'number' ? `[${part}]` : i === 0 ? part : `.${part}`))
    .join('');
}

/**
 * The text shown on stderr for any failure. Unexpected errors keep their stack only when
 * LOCALIS_DEBUG is set: on a login node a stack trace hides the one line that matters.
 */
export function formatError(error: unknown, env: NodeJS.ProcessEnv = process.env): string {
  if (isCliError(error)) {
    const lines = [`localis: ${error.message}`];
    for (const d of error.details) lines.push(`  ${formatPath(d.path)}: ${d.message}`);
    if (error.hint) lines.push(error.hint);
    return lines.join('\n');
  }
  const e = error instanceof Error ? error : new Error(String(error));
  const text = `localis: unexpected error: ${e.message}`;
  if (env.LOCALIS_DEBUG) return `${text}\n${e.stack ?? ''}`;
  return `${text}\n(set LOCALIS_DEBUG=1 to see where it happened)`;
}
