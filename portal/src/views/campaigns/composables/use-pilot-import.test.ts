import { fitPilotTimings, type PilotTiming } from '@localis/shared';
import { describe, expect, it } from 'vitest';
import { ref } from 'vue';
import { MAX_PILOT_FILE_BYTES, usePilotImport } from './use-pilot-import';

const GOOD = 'size,seconds,cores\n8,40,64\n12,300,64\n16,1300,64\n';

function setup(start: PilotTiming[] = []) {
  const timings = ref<PilotTiming[]>(start);
  return { timings, pilot: usePilotImport(timings) };
}

describe('usePilotImport', () => {
  describe('reading pasted text', () => {
    it('should put the timings in the spec and fit them when the CSV is valid', () => {
      const { timings, pilot } = setup();
      pilot.text.value = GOOD;

      expect(pilot.readText()).toBe(true);

      expect(timings.value).toEqual([
        { size: 8, seconds: 40, cores: 64 },
        { size: 12, seconds: 300, cores: 64 },
        { size: 16, seconds: 1300, cores: 64 },
      ]);
      expect(pilot.problems.value).toEqual([]);
      expect(pilot.fit.value).toEqual(fitPilotTimings(timings.value));
      expect(pilot.fit.value!.exponent).toBeGreaterThan(4.5);
      expect(pilot.status.value).toBe('Read 3 pilot timings from the pasted text.');
    });

    it('should give each problem with its line and keep the old timings when a line is wrong', () => {
      const before = [
        { size: 8, seconds: 40, cores: 64 },
        { size: 16, seconds: 1300, cores: 64 },
      ];
      const { timings, pilot } = setup(before);
      pilot.text.value = 'size,seconds,cores\n8,40,64\n12,-3,64\n16,abc,64\n';

      expect(pilot.readText()).toBe(false);

      expect(timings.value).toEqual(before);
      expect(pilot.problemLines.value).toEqual(['Line 3: seconds must be greater than 0', 'Line 4: seconds must be a number (read "abc")']);
      expect(pilot.problems.value.map((p) => p.path)).toEqual([
        ['pilotTimings', 1, 'seconds'],
        ['pilotTimings', 2, 'seconds'],
      ]);
    });

    it('should name the missing columns when the header lacks one', () => {
      const { pilot } = setup();
      pilot.text.value = 'L,seconds\n8,40\n';

      pilot.readText();

      expect(pilot.problemLines.value[0]).toMatch(/missing: size, cores/);
    });

    it('should refuse a single size when a power law needs two', () => {
      const { timings, pilot } = setup();
      pilot.text.value = 'size,seconds,cores\n8,40,64\n8,41,64\n';

      expect(pilot.readText()).toBe(false);
      expect(timings.value).toEqual([]);
      expect(pilot.problemLines.value).toEqual(['Pilot timings need at least two different sizes to fit a power law']);
    });
  });

  describe('reading a file', () => {
    it('should read the chosen file and show its text when it is a pilot CSV', async () => {
      const { timings, pilot } = setup();

      expect(await pilot.readFile(new File([GOOD], 'pilots.csv', { type: 'text/csv' }))).toBe(true);

      expect(pilot.text.value).toBe(GOOD);
      expect(timings.value).toHaveLength(3);
      expect(pilot.status.value).toBe('Read 3 pilot timings from pilots.csv.');
    });

    it('should not read a file far larger than a pilot CSV', async () => {
      const { timings, pilot } = setup();
      const big = new File(['x'.repeat(MAX_PILOT_FILE_BYTES + 1)], 'results.tar', { type: 'application/x-tar' });

      expect(await pilot.readFile(big)).toBe(false);

      expect(timings.value).toEqual([]);
      expect(pilot.problemLines.value[0]).toMatch(/^The file results\.tar is \d+ KiB/);
    });
  });

  describe('removing', () => {
    it('should empty the timings and the fit when they are removed', () => {
      const { timings, pilot } = setup();
      pilot.text.value = GOOD;
      pilot.readText();

      pilot.remove();

      expect(timings.value).toEqual([]);
      expect(pilot.fit.value).toBeNull();
      expect(pilot.text.value).toBe('');
    });
  });
});
