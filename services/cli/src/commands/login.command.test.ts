import { existsSync, readFileSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { demoToken, RESEARCHER, runCli, tempConfigDir } from '../../test/cli-harness';

let config: ReturnType<typeof tempConfigDir>;
beforeEach(() => {
  config = tempConfigDir();
});
afterEach(() => config.remove());

const credentials = () => join(config.dir, 'credentials.json');

describe.skipIf(!process.env.PUBLIC_URL)('localis login', () => {
  const url = process.env.PUBLIC_URL!;

  describe('a valid token', () => {
    it('should sign in, store the token 0600 and print name, e-mail and roles when given with --token', async () => {
      const token = demoToken(RESEARCHER);
      const r = await runCli(['login', '--url', url, '--token', token], { configDir: config.dir });
      expect(r.stderr).toBe('');
      expect(r.code).toBe(0);
      expect(r.stdout).toContain(`Signed in to ${url} as Ines Albrecht <${RESEARCHER}> (roles: researcher)`);
      expect(r.stdout).toContain(`Token ${token.slice(0, 10)}… stored as profile "default"`);
      expect(r.stdout).not.toContain(token);
      expect(statSync(credentials()).mode & 0o777).toBe(0o600);
      expect(JSON.parse(readFileSync(credentials(), 'utf8'))).toEqual({ profiles: { default: { url, token } } });
    });

    it('should read the token from stdin when it is piped in', async () => {
      const r = await runCli(['login', '--url', url], { configDir: config.dir, input: `${demoToken(RESEARCHER)}\n` });
      expect(r.code).toBe(0);
      expect(r.stdout).toContain('as Ines Albrecht');
    });

    it('should store the portal base address when the API root is pasted as --url', async () => {
      const r = await runCli(['login', '--url', `${url}/api/v1/`, '--token', demoToken(RESEARCHER)], { configDir: config.dir });
      expect(r.code).toBe(0);
      expect(JSON.parse(readFileSync(credentials(), 'utf8')).profiles.default.url).toBe(url);
    });

    it('should take the URL from LOCALIS_URL when --url is not given', async () => {
      const r = await runCli(['login', '--profile', 'test'], { configDir: config.dir, input: demoToken(RESEARCHER), env: { LOCALIS_URL: url } });
      expect(r.code).toBe(0);
      expect(JSON.parse(readFileSync(credentials(), 'utf8')).profiles.test.url).toBe(url);
    });
  });

  describe('a refused token', () => {
    it('should exit 3, show the server message and store nothing when the token is unknown', async () => {
      const r = await runCli(['login', '--url', url, '--token', 'lcs_notarealtokennotarealtoken'], { configDir: config.dir });
      expect(r.code).toBe(3);
      expect(r.stderr).toContain('localis: This API token is not known.');
      expect(r.stderr).toContain('The token was not stored.');
      expect(r.stdout).toBe('');
      expect(existsSync(credentials())).toBe(false);
    });
  });

  describe('usage errors', () => {
    it('should exit 2 and say how to give a token when stdin is empty and not a terminal', async () => {
      const r = await runCli(['login', '--url', url], { configDir: config.dir, input: '' });
      expect(r.code).toBe(2);
      expect(r.stderr).toContain('no API token was given on standard input');
    });

    it('should exit 2 when --url is not an http(s) address', async () => {
      const r = await runCli(['login', '--url', 'localis.example.org', '--token', 'lcs_x'], { configDir: config.dir });
      expect(r.code).toBe(2);
      expect(r.stderr).toContain('is not a URL');
    });

    it('should exit 2 when an option is unknown', async () => {
      const r = await runCli(['login', '--tokn', 'x'], { configDir: config.dir });
      expect(r.code).toBe(2);
      expect(r.stderr).toContain("unknown option '--tokn'");
    });
  });
});

describe('localis login without a portal', () => {
  it('should name the URL and say the connection was refused when nothing listens there', async () => {
    const config = tempConfigDir();
    try {
      // 4 is unassigned and, unlike 9, not on fetch's list of refused ports.
      const r = await runCli(['login', '--url', 'http://127.0.0.1:4', '--token', 'lcs_whatever'], { configDir: config.dir });
      expect(r.code).toBe(1);
      expect(r.stderr).toContain('localis: cannot reach Localis at http://127.0.0.1:4: connection refused');
      expect(existsSync(join(config.dir, 'credentials.json'))).toBe(false);
    } finally {
      config.remove();
    }
  });

  it('should give a clear message when the URL uses port 9', async () => {
    const config = tempConfigDir();
    try {
      const r = await runCli(['login', '--url', 'http://127.0.0.1:9', '--token', 'lcs_whatever'], { configDir: config.dir });
      expect(r.code).toBe(1);
      expect(r.stderr).toMatch(/^localis: cannot reach Localis at http:\/\/127\.0\.0\.1:9: /);
      expect(r.stderr).not.toMatch(/\n\s+at /);
    } finally {
      config.remove();
    }
  });
});
