import { afterAll, describe, expect, it } from 'vitest';
import { runCli, tempConfigDir } from '../test/cli-harness';

const config = tempConfigDir();
afterAll(() => config.remove());

describe('localis', () => {
  describe('help', () => {
    it('should list the commands, the environment and the exit codes when run with --help', async () => {
      const r = await runCli(['--help'], { configDir: config.dir });
      expect(r.code).toBe(0);
      for (const command of ['login', 'whoami', 'logout', 'estimate', 'tmm', 'analyze']) expect(r.stdout).toMatch(new RegExp(`^  ${command} `, 'm'));
      expect(r.stdout).toContain('LOCALIS_TOKEN');
      expect(r.stdout).toContain('Exit codes: 0 ok, 1 failed, 2 usage error, 3 not signed in');
    });

    it('should show an example when a command is asked for its help', async () => {
      for (const command of ['login', 'whoami', 'logout', 'estimate', 'tmm', 'analyze']) {
        const r = await runCli([command, '--help'], { configDir: config.dir });
        expect(r.code).toBe(0);
        expect(r.stdout).toContain('Examples:');
        expect(r.stdout).toContain(`$ localis ${command}`);
      }
    });

    it('should print the version when run with --version', async () => {
      const r = await runCli(['--version'], { configDir: config.dir });
      expect(r.code).toBe(0);
      expect(r.stdout.trim()).toMatch(/^\d+\.\d+\.\d+$/);
    });
  });

  describe('usage errors', () => {
    it('should exit 2 and point to --help when the command is unknown', async () => {
      const r = await runCli(['upload-everything'], { configDir: config.dir });
      expect(r.code).toBe(2);
      expect(r.stderr).toContain("unknown command 'upload-everything'");
      expect(r.stderr).toContain('--help');
    });

    it('should exit 2 and show the help when no command is given', async () => {
      const r = await runCli([], { configDir: config.dir });
      expect(r.code).toBe(2);
      expect(r.stderr).toContain('Usage: localis');
    });
  });
});
