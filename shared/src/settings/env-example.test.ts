import { readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { describe, expect, it } from 'vitest';
import { parse } from 'dotenv';
import { loadSettings, Settings } from './settings';

const example = parse(readFileSync(resolve(import.meta.dirname, '../../../.env.example')));

describe('.env.example', () => {
  describe('completeness', () => {
    it('should list every setting the code reads, with its default', () => {
      const defaults = loadSettings({});
      expect(Object.keys(example).sort()).toEqual(Object.keys(Settings.shape).sort());
      for (const [key, value] of Object.entries(example)) {
        expect(String(defaults[key as keyof typeof defaults]), key).toBe(value);
      }
    });
  });
});
