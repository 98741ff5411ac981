import { createInterface } from 'node:readline';
import { Writable } from 'node:stream';
import { CliError, EXIT } from './cli-error';

/** A token is one line of ~50 characters; anything far longer is a wrong file piped in. */
const MAX_STDIN_BYTES = 16 * 1024;

export interface TokenSource {
  input: NodeJS.ReadableStream & { isTTY?: boolean };
  /** Where the prompt goes: stderr, so stdout stays clean for scripts. */
  output: NodeJS.WritableStream;
}

const terminal: TokenSource = { input: process.stdin, output: process.stderr };

/**
 * The token from --token, else from a pipe (`echo $T | localis login`), else typed at a hidden
 * prompt. A pipe is read rather than prompted on, so scripts never hang on a prompt nobody sees.
 */
export async function obtainToken(opts: { given?: string; promptText: string }, source: TokenSource = terminal): Promise<string> {
  if (opts.given !== undefined) return checkToken(opts.given, 'the --token option');
  if (!source.input.isTTY) return checkToken(firstLine(await readAll(source.input)), 'standard input');
  return checkToken(await promptHidden(opts.promptText, source), 'the prompt');
}

function checkToken(raw: string, from: string): string {
  const token = raw.trim();
  if (!token) {
    throw new CliError(`no API token was given on ${from}.`, {
      exitCode: EXIT.usage,
      hint: 'Pass it with --token, pipe it in (`localis login < token-file`), or run `localis login` in a terminal to be asked for it.',
    });
  }
  if (/\s/.test(token)) throw new CliError(`the API token from ${from} contains spaces; paste the token alone.`, { exitCode: EXIT.usage });
  return token;
}

function firstLine(text: string): string {
  return text.split(/\r?\n/).find((line) => line.trim() !== '') ?? '';
}

export async function readAll(input: NodeJS.ReadableStream): Promise<string> {
  const chunks: Buffer[] = [];
  let size = 0;
  for await (const chunk of input) {
    const buffer = typeof chunk === 'string' ? Buffer.from(chunk) : chunk;
    size += buffer.length;
    if (size > MAX_STDIN_BYTES) throw new CliError('standard input holds far more than one API token; pipe in just the token.', { exitCode: EXIT.usage });
    chunks.push(buffer);
  }
  return Buffer.concat(chunks).toString('utf8');
}

/**
 * Ask for a secret without echoing it: readline writes through a stream that drops everything
 * after the prompt, so the typed characters never reach the screen (or the scrollback of a
 * shared tmux session).
 */
export function promptHidden(prompt: string, source: TokenSource = terminal): Promise<string> {
  let muted = false;
  const screen = new Writable({
    write(chunk, encoding, done) {
      if (!muted) source.output.write(chunk, encoding);
      done();
    },
  });
  const rl = createInterface({ input: source.input, output: screen, terminal: true });
  return new Promise((resolve, reject) => {
    let answered = false;
    const cancel = () => {
      if (answered) return;
      answered = true;
      source.output.write('\n');
      reject(new CliError('cancelled; nothing was stored.', { exitCode: EXIT.interrupted }));
    };
    rl.on('SIGINT', () => {
      cancel();
      rl.close();
    });
    // Ctrl-D, or the terminal went away.
    rl.on('close', cancel);
    rl.question(prompt, (answer) => {
      answered = true;
      rl.close();
      // The Enter key was muted with the rest; end the prompt line ourselves.
      source.output.write('\n');
      resolve(answer);
    });
    muted = true;
  });
}
