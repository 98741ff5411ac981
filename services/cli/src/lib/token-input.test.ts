import { PassThrough, Readable } from 'node:stream';
import { describe, expect, it } from 'vitest';
import { obtainToken, promptHidden } from './token-input';
import { failure } from '../../test/cli-error-of';

const TOKEN = 'lcs_kzZyaKYfY_lLQp5JBPCLp1I5FMLMM5aKbYRb6QaS4Q8';

/** A pipe as a batch script gives it: not a terminal, ends after its content. */
function pipe(text: string) {
  return { input: Readable.from([Buffer.from(text)]), output: new PassThrough() };
}

describe('token-input', () => {
  describe('from --token', () => {
    it('should use the option and trim it when given', async () => {
      expect(await obtainToken({ given: ` ${TOKEN} `, promptText: '' }, pipe('ignored'))).toBe(TOKEN);
    });
  });

  describe('from a pipe', () => {
    it('should read the first line when stdin is not a terminal', async () => {
      expect(await obtainToken({ promptText: '' }, pipe(`${TOKEN}\n`))).toBe(TOKEN);
      expect(await obtainToken({ promptText: '' }, pipe(`\n  ${TOKEN}\r\nsecond line\n`))).toBe(TOKEN);
    });

    it('should fail with exit code 2 and say how to give a token when the pipe is empty', async () => {
      const e = await failure(obtainToken({ promptText: '' }, pipe('')));
      expect(e.exitCode).toBe(2);
      expect(e.message).toBe('no API token was given on standard input.');
      expect(e.hint).toMatch(/--token/);
    });

    it('should refuse a line with spaces when something other than a token was piped in', async () => {
      const e = await failure(obtainToken({ promptText: '' }, pipe('export LOCALIS_TOKEN=abc def\n')));
      expect(e.exitCode).toBe(2);
    });

    it('should refuse a large input when a wrong file is piped in', async () => {
      const e = await failure(obtainToken({ promptText: '' }, pipe('x'.repeat(100_000))));
      expect(e.message).toMatch(/far more than one API token/);
    });
  });

  describe('hidden prompt', () => {
    it('should show the prompt but not the typed token when asking', async () => {
      const input = new PassThrough();
      const output = new PassThrough();
      let screen = '';
      output.on('data', (d: Buffer) => (screen += d.toString()));
      const answer = promptHidden('Paste it here: ', { input, output });
      input.write(`${TOKEN}\n`);
      expect(await answer).toBe(TOKEN);
      expect(screen).toContain('Paste it here: ');
      expect(screen).not.toContain(TOKEN.slice(4));
    });

    it('should cancel with exit code 130 and store nothing when input ends before Enter', async () => {
      const input = new PassThrough();
      const answer = promptHidden('Paste it here: ', { input, output: new PassThrough() });
      input.end();
      const e = await failure(answer);
      expect(e).toMatchObject({ exitCode: 130, message: 'cancelled; nothing was stored.' });
    });
  });
});
