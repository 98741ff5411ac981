import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { ADMIN, demoToken, RESEARCHER, runCli, tempConfigDir } from '../../test/cli-harness';

let config: ReturnType<typeof tempConfigDir>;
beforeEach(() => {
  config = tempConfigDir();
});
afterEach(() => config.remove());

describe.skipIf(!process.env.PUBLIC_URL)('localis logout', () => {
  const url = process.env.PUBLIC_URL!;

  describe('a stored token', () => {
    it('should forget it, say it stays valid until revoked, and leave whoami signed out', async () => {
      await runCli(['login', '--url', url, '--token', demoToken(RESEARCHER)], { configDir: config.dir });
      const r = await runCli(['logout'], { configDir: config.dir });
      expect(r.code).toBe(0);
      expect(r.stdout).toContain(`Forgot the token ${demoToken(RESEARCHER).slice(0, 10)}…`);
      expect(r.stdout).toContain(`stays valid until it expires or you revoke it on ${url}/profile under "API tokens"`);
      expect((await runCli(['whoami'], { configDir: config.dir })).code).toBe(3);
    });

    it('should keep the other profiles when one is forgotten', async () => {
      await runCli(['login', '--url', url, '--token', demoToken(RESEARCHER)], { configDir: config.dir });
      await runCli(['login', '--url', url, '--profile', 'office', '--token', demoToken(ADMIN)], { configDir: config.dir });
      await runCli(['logout', '--profile', 'office'], { configDir: config.dir });
      const stored = JSON.parse(readFileSync(join(config.dir, 'credentials.json'), 'utf8'));
      expect(Object.keys(stored.profiles)).toEqual(['default']);
    });
  });

  describe('nothing stored', () => {
    it('should say there is nothing to forget and exit 0', async () => {
      const r = await runCli(['logout'], { configDir: config.dir });
      expect(r.code).toBe(0);
      expect(r.stdout).toContain('nothing to forget');
    });
  });
});
