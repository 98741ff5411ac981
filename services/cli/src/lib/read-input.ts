import { readFileSync, statSync } from 'node:fs';
import { CliError, EXIT } from './cli-error';

/** Far above any campaign spec or pilot CSV; a larger input is the wrong file, not a big campaign. */
export const MAX_INPUT_BYTES = 16 * 1024 * 1024;

export interface Input {
  /** How messages name it: the path as given, or "standard input" for `-`. */
  name: string;
  text: string;
}

const REASONS: Record<string, string> = {
  ENOENT: 'no such file',
  EACCES: 'permission denied',
  EPERM: 'permission denied',
  EISDIR: 'it is a folder, not a file',
  ENOTDIR: 'a part of the path is not a folder',
  ELOOP: 'too many symbolic links',
};

/**
 * The text of a file, or of standard input for `-` (so a spec can be piped from another tool).
 * A file that cannot be read exits 1; an input that is plainly the wrong thing exits 2.
 */
export async function readInput(path: string, what: string, stdin: NodeJS.ReadStream = process.stdin): Promise<Input> {
  if (path === '-') {
    // A terminal on stdin would wait silently for typing nobody intends; a batch job would hang.
    if (stdin.isTTY) {
      throw new CliError(`\`-\` reads the ${what} from standard input, but that is a terminal.`, {
        exitCode: EXIT.usage,
        hint: 'Pipe it in, e.g. `localis estimate - < spec.json`, or give the file name instead of `-`.',
      });
    }
    return { name: 'standard input', text: stripBom(await readStream(stdin, what)) };
  }
  try {
    if (statSync(path).size > MAX_INPUT_BYTES) throw tooLarge(path, what);
    return { name: path, text: stripBom(readFileSync(path, 'utf8')) };
  } catch (e) {
    if (e instanceof CliError) throw e;
    const code = (e as NodeJS.ErrnoException).code ?? '';
    throw new CliError(`cannot read the ${what} ${path}: ${REASONS[code] ?? (e as Error).message}.`, { exitCode: EXIT.failed, cause: e });
  }
}

async function readStream(input: NodeJS.ReadableStream, what: string): Promise<string> {
  const chunks: Buffer[] = [];
  let size = 0;
  for await (const chunk of input) {
    const buffer = typeof chunk === 'string' ? Buffer.from(chunk) : chunk;
    size += buffer.length;
    if (size > MAX_INPUT_BYTES) throw tooLarge('standard input', what);
    chunks.push(buffer);
  }
  return Buffer.concat(chunks).toString('utf8');
}

function tooLarge(name: string, what: string): CliError {
  return new CliError(`${name} is larger than ${MAX_INPUT_BYTES / 1024 / 1024} MiB; that is not a ${what}. Check the file name.`, { exitCode: EXIT.usage });
}

/** Editors on Windows start UTF-8 files with a byte-order mark, which JSON.parse refuses. */
function stripBom(text: string): string {
  return text.replace(/^\uFEFF/, '');
}
