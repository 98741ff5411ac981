import { chmodSync, mkdtempSync, readdirSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { configDir, credentialsPath, loadProfile, readCredentials, removeProfile, saveProfile } from './credentials';

let root: string;
let env: NodeJS.ProcessEnv;
const mode = (path: string) => statSync(path).mode & 0o777;
const ines = { url: 'http://127.0.0.1:4200', token: 'lcs_kzZyaKYfY_lLQp5JBPCLp1I5FMLMM5aKbYRb6QaS4Q8' };
const dana = { url: 'https://localis.example.org', token: 'lcs_C0VjYIIg92guLLlzwbpfYebWOyD0zGjy9fND7GhFEPQ' };

beforeEach(() => {
  root = mkdtempSync(join(tmpdir(), 'localis-credentials-'));
  // A folder that does not exist yet, as on a first login.
  env = { LOCALIS_CONFIG_DIR: join(root, 'config', 'localis') };
});
afterEach(() => {
  vi.restoreAllMocks();
  rmSync(root, { recursive: true, force: true });
});

describe('credentials', () => {
  describe('where the file lives', () => {
    it('should use LOCALIS_CONFIG_DIR when it is set', () => {
      expect(credentialsPath({ LOCALIS_CONFIG_DIR: '/x/y' })).toBe('/x/y/credentials.json');
    });

    it('should use XDG_CONFIG_HOME when LOCALIS_CONFIG_DIR is unset', () => {
      expect(configDir({ XDG_CONFIG_HOME: '/home/ines/.cfg', HOME: '/home/ines' })).toBe('/home/ines/.cfg/localis');
    });

    it('should use ~/.config/localis when neither is set', () => {
      expect(configDir({ HOME: '/home/ines' })).toBe('/home/ines/.config/localis');
    });
  });

  describe('file modes', () => {
    it('should create the file with mode 0600 and the folder with 0700 when saving the first profile', () => {
      const path = saveProfile('default', ines, env);
      expect(path).toBe(join(env.LOCALIS_CONFIG_DIR!, 'credentials.json'));
      expect(mode(path)).toBe(0o600);
      expect(mode(env.LOCALIS_CONFIG_DIR!)).toBe(0o700);
    });

    it('should keep mode 0600 when the umask would allow more', () => {
      const old = process.umask(0o000);
      try {
        expect(mode(saveProfile('default', ines, env))).toBe(0o600);
      } finally {
        process.umask(old);
      }
    });

    it('should close an existing folder to others when it was open', () => {
      saveProfile('default', ines, env);
      chmodSync(env.LOCALIS_CONFIG_DIR!, 0o755);
      saveProfile('default', dana, env);
      expect(mode(env.LOCALIS_CONFIG_DIR!)).toBe(0o700);
    });

    it('should tighten a file readable by others to 0600 and warn when it is read', () => {
      const path = saveProfile('default', ines, env);
      chmodSync(path, 0o644);
      const stderr = vi.spyOn(process.stderr, 'write').mockImplementation(() => true);
      expect(loadProfile('default', env)).toEqual(ines);
      expect(mode(path)).toBe(0o600);
      expect(String(stderr.mock.calls[0]?.[0])).toMatch(/readable by others \(mode 0644\); it is now 0600/);
    });

    it('should leave no temporary file behind when saving', () => {
      saveProfile('default', ines, env);
      saveProfile('other', dana, env);
      expect(readdirSync(env.LOCALIS_CONFIG_DIR!)).toEqual(['credentials.json']);
    });
  });

  describe('profiles', () => {
    it('should return nothing when no file exists yet', () => {
      expect(loadProfile('default', env)).toBeUndefined();
      expect(readCredentials(env)).toEqual({ profiles: {} });
    });

    it('should keep the other profiles when one is saved or replaced', () => {
      saveProfile('default', ines, env);
      saveProfile('admin', dana, env);
      saveProfile('default', { ...ines, token: 'lcs_replacedreplacedreplaced' }, env);
      expect(loadProfile('admin', env)).toEqual(dana);
      expect(loadProfile('default', env)?.token).toBe('lcs_replacedreplacedreplaced');
    });

    it('should forget one profile and return what it held when removed', () => {
      saveProfile('default', ines, env);
      saveProfile('admin', dana, env);
      expect(removeProfile('default', env)).toEqual(ines);
      expect(loadProfile('default', env)).toBeUndefined();
      expect(loadProfile('admin', env)).toEqual(dana);
      expect(mode(credentialsPath(env))).toBe(0o600);
    });

    it('should return undefined when removing a profile that is not stored', () => {
      expect(removeProfile('nothing-here', env)).toBeUndefined();
    });

    it('should refuse a profile name when it could be a path or is empty', () => {
      for (const name of ['../x', '', 'a b', '.hidden']) {
        expect(() => saveProfile(name, ines, env), name).toThrow(/cannot be a profile name/);
      }
    });
  });

  describe('damaged files', () => {
    it('should name the file and say what to do when it is not JSON', () => {
      saveProfile('default', ines, env);
      writeFileSync(credentialsPath(env), '{ not json', { mode: 0o600 });
      expect(() => loadProfile('default', env)).toThrow(`${credentialsPath(env)} is not valid JSON.`);
    });

    it('should refuse a file when its shape is not a credentials file', () => {
      saveProfile('default', ines, env);
      writeFileSync(credentialsPath(env), JSON.stringify({ profiles: { default: { url: 'x' } } }), { mode: 0o600 });
      expect(() => loadProfile('default', env)).toThrow(/is not a Localis credentials file/);
    });
  });
});
