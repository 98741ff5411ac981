import { describe, expect, it } from 'vitest';
import { analysisFixture } from './analysis-fixture';
import { failureWords, isMoving, latestFinished, newestFirst, progressPercent, shownAnalysis } from './analysis-state';

const older = analysisFixture({ createdAt: '2027-03-01T09:00:00.000Z' });
const newer = analysisFixture({ createdAt: '2027-03-02T09:00:00.000Z' });
const failed = analysisFixture({ state: 'failed', result: null, error: 'A finite-size scaling fit needs at least three sizes L; the table has 2 (8, 12)', createdAt: '2027-03-03T09:00:00.000Z' });
const running = analysisFixture({ state: 'running', result: null, progress: { done: 40, total: 229 }, createdAt: '2027-03-04T09:00:00.000Z' });

describe('analysis-state', () => {
  describe('which analysis is shown', () => {
    it('should show the newest finished one, past a newer running or failed one', () => {
      expect(latestFinished([older, running, failed, newer])).toBe(newer);
      expect(shownAnalysis([running, failed, newer, older], null)).toBe(newer);
      expect(latestFinished([running, failed])).toBeNull();
    });

    it('should show the one picked when it is finished or failed, and ignore a pick that is running or unknown', () => {
      expect(shownAnalysis([running, failed, newer, older], older.id)).toBe(older);
      expect(shownAnalysis([running, failed, newer, older], failed.id)).toBe(failed);
      expect(shownAnalysis([running, failed, newer, older], running.id)).toBe(newer);
      expect(shownAnalysis([newer], 'no-such-id')).toBe(newer);
    });

    it('should order newest first', () => {
      expect(newestFirst([older, running, newer]).map((a) => a.id)).toEqual([running.id, newer.id, older.id]);
    });
  });

  describe('progress', () => {
    it('should count whole percent of the fits, and nothing before the worker has counted', () => {
      expect(progressPercent({ done: 40, total: 229 })).toBe(17);
      expect(progressPercent({ done: 229, total: 229 })).toBe(100);
      expect(progressPercent(null)).toBeNull();
      expect(progressPercent({ done: 0, total: 0 })).toBeNull();
      expect(isMoving(running)).toBe(true);
      expect(isMoving(analysisFixture({ state: 'queued' }))).toBe(true);
      expect(isMoving(failed)).toBe(false);
    });
  });

  describe('a failure', () => {
    it('should give the worker’s reason as a sentence, or plain words when it gave none', () => {
      expect(failureWords(failed)).toBe('A finite-size scaling fit needs at least three sizes L; the table has 2 (8, 12).');
      expect(failureWords({ error: 'Bad table!' })).toBe('Bad table!');
      expect(failureWords({ error: null })).toContain('stopped without saying why');
    });
  });
});
