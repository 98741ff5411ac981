import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { Profile } from '@localis/shared';
import { ADMIN, demoToken, RESEARCHER, runCli, tempConfigDir } from '../../test/cli-harness';

let config: ReturnType<typeof tempConfigDir>;
beforeEach(() => {
  config = tempConfigDir();
});
afterEach(() => config.remove());

describe.skipIf(!process.env.PUBLIC_URL)('localis whoami', () => {
  const url = process.env.PUBLIC_URL!;
  const login = async (email: string, profile = 'default') => {
    const r = await runCli(['login', '--url', url, '--profile', profile, '--token', demoToken(email)], { configDir: config.dir });
    expect(r.code, r.stderr).toBe(0);
  };

  describe('after login', () => {
    it('should print name, e-mail, institution, roles, groups, portal and masked token', async () => {
      await login(RESEARCHER);
      const r = await runCli(['whoami'], { configDir: config.dir });
      expect(r.code, r.stderr).toBe(0);
      expect(r.stdout).toContain(`Ines Albrecht <${RESEARCHER}>`);
      expect(r.stdout).toMatch(/institution\s+Brennmoor Institute of Lattice Physics/);
      expect(r.stdout).toMatch(/roles\s+researcher/);
      expect(r.stdout).toMatch(/groups\s+Disordered Lattices\n/);
      expect(r.stdout).toMatch(new RegExp(`portal\\s+${url}`));
      expect(r.stdout).toContain(`${demoToken(RESEARCHER).slice(0, 10)}… (profile "default")`);
      expect(r.stdout).not.toContain(demoToken(RESEARCHER));
    });

    it('should mark the groups the person leads with (PI)', async () => {
      await login('tobias.wendt@brennmoor.example');
      const r = await runCli(['whoami'], { configDir: config.dir });
      expect(r.stdout).toContain('Disordered Lattices (PI)');
      expect(r.stdout).toMatch(/roles\s+pi, researcher|roles\s+researcher, pi/);
    });

    it('should use the named profile when several are stored', async () => {
      await login(RESEARCHER);
      await login(ADMIN, 'office');
      const r = await runCli(['whoami', '--profile', 'office'], { configDir: config.dir });
      expect(r.stdout).toContain('Dana Whitfield');
      expect(r.stdout).toMatch(/roles\s+admin/);
    });
  });

  describe('--json', () => {
    it('should print the profile as JSON that parses and matches the shared schema', async () => {
      await login(RESEARCHER);
      const r = await runCli(['whoami', '--json'], { configDir: config.dir });
      expect(r.code).toBe(0);
      const me = Profile.parse(JSON.parse(r.stdout));
      expect(me.person.email).toBe(RESEARCHER);
      expect(me.groups).toEqual([expect.objectContaining({ name: 'Disordered Lattices', isPi: false })]);
    });
  });

  describe('environment', () => {
    it('should sign in from LOCALIS_TOKEN and LOCALIS_URL alone when nothing is stored', async () => {
      const r = await runCli(['whoami'], { configDir: config.dir, env: { LOCALIS_URL: url, LOCALIS_TOKEN: demoToken(ADMIN) } });
      expect(r.code, r.stderr).toBe(0);
      expect(r.stdout).toContain('Dana Whitfield');
      expect(r.stdout).toContain('(from LOCALIS_TOKEN)');
      expect(r.stdout).toContain('(from LOCALIS_URL)');
    });
  });

  describe('not signed in', () => {
    it('should exit 3 and suggest login when nothing is stored', async () => {
      const r = await runCli(['whoami'], { configDir: config.dir });
      expect(r.code).toBe(3);
      expect(r.stderr).toContain('localis: you are not signed in.');
      expect(r.stderr).toContain('localis login');
    });

    it('should exit 3 with the server message when the token is refused', async () => {
      const r = await runCli(['whoami'], { configDir: config.dir, env: { LOCALIS_URL: url, LOCALIS_TOKEN: 'lcs_notarealtokennotarealtoken' } });
      expect(r.code).toBe(3);
      expect(r.stderr).toContain('This API token is not known.');
      expect(r.stderr).toContain('LOCALIS_TOKEN');
    });
  });
});
