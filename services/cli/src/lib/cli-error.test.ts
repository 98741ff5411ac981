import { describe, expect, it } from 'vitest';
import { CliError, EXIT, formatError, formatPath } from './cli-error';

describe('cli-error', () => {
  describe('formatError of a CliError', () => {
    it('should print the message after the program name when there is nothing else', () => {
      expect(formatError(new CliError('you are not signed in.'))).toBe('localis: you are not signed in.');
    });

    it('should print each detail as a "path: message" line when the server sent details', () => {
      const error = new CliError('Some fields of the request are not valid.', {
        details: [
          { path: ['name'], message: 'give the token a name' },
          { path: ['sizes', 2, 'L'], message: 'must be even' },
          { path: [], message: 'body is empty' },
        ],
      });
      expect(formatError(error)).toBe(
        [
          'localis: Some fields of the request are not valid.',
          '  name: give the token a name',
          '  sizes[2].L: must be even',
          '  (request): body is empty',
        ].join('\n'),
      );
    });

    it('should end with the hint when one is given', () => {
      const error = new CliError('bad token', { exitCode: EXIT.notSignedIn, hint: 'Run `localis login`.' });
      expect(formatError(error)).toBe('localis: bad token\nRun `localis login`.');
    });
  });

  describe('formatError of an unexpected error', () => {
    it('should show the message without a stack when LOCALIS_DEBUG is unset', () => {
      const text = formatError(new Error('boom'), {});
      expect(text).toContain('localis: unexpected error: boom');
      expect(text).toContain('LOCALIS_DEBUG=1');
      expect(text).not.toMatch(/\n\s+at /);
    });

    it('should add the stack when LOCALIS_DEBUG is set', () => {
      expect(formatError(new Error('boom'), { LOCALIS_DEBUG: '1' })).toMatch(/\n\s+at /);
    });

    it('should cope when something other than an Error is thrown', () => {
      expect(formatError('plain string', {})).toContain('unexpected error: plain string');
    });
  });

  describe('exit codes', () => {
    it('should default to 1 when no exit code is given', () => {
      expect(new CliError('x').exitCode).toBe(1);
    });

    it('should keep the documented numbers when scripts rely on them', () => {
      expect(EXIT).toMatchObject({ ok: 0, failed: 1, usage: 2, notSignedIn: 3 });
    });
  });

  describe('formatPath', () => {
    it('should write indices in brackets and names with dots when the path mixes both', () => {
      expect(formatPath(['energies', 0])).toBe('energies[0]');
      expect(formatPath([0, 'W'])).toBe('[0].W');
    });
  });
});
