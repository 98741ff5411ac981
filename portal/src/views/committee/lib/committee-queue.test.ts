import type { CommitteeQueueItem } from '@localis/shared';
import { describe, expect, it } from 'vitest';
import { queueItemFixture as item } from '../test/queue-item-fixture';
import { queuePage, queueQueryProblems, reviewProgress, scopeOf, scopeValue, sortQueue } from './committee-queue';

const titles = (items: CommitteeQueueItem[]) => items.map((i) => i.title);

describe('committee-queue', () => {
  describe('scopeOf', () => {
    it('should show a committee member their own assignments when the address says nothing', () => {
      expect(scopeOf({}, true)).toBe('mine');
    });

    it('should show everything when the address asks for all', () => {
      expect(scopeOf({ scope: 'all' }, true)).toBe('all');
    });

    it('should show everything to the office when the person is not on the committee', () => {
      expect(scopeOf({ scope: 'mine' }, false)).toBe('all');
    });

    it('should leave the default scope out of the address', () => {
      expect(scopeValue('mine')).toBeNull();
      expect(scopeValue('all')).toBe('all');
    });
  });

  describe('queueQueryProblems', () => {
    it('should find nothing wrong when the round is an id', () => {
      expect(queueQueryProblems({ scope: 'mine', roundId: '9a8b7c6d-5e4f-4a3b-8c2d-1e0f9a8b7c6d' })).toEqual({});
    });

    it('should say what is wrong with the round when the address was edited by hand', () => {
      expect(queueQueryProblems({ scope: 'all', roundId: 'spring' })).toEqual({ roundId: 'roundId must be a round id' });
    });
  });

  describe('sortQueue', () => {
    const a = item({ title: 'A', requestedCoreHours: 300, meanScore: 4.2, submittedAt: '2027-01-12T00:00:00.000Z', assigned: 2, reviewed: 2 });
    const b = item({ title: 'B', requestedCoreHours: 100, meanScore: null, submittedAt: '2027-01-10T00:00:00.000Z', assigned: 0, reviewed: 0 });
    const c = item({ title: 'C', requestedCoreHours: 200, meanScore: 3.1, submittedAt: '2027-01-11T00:00:00.000Z', assigned: 4, reviewed: 1 });

    it('should put the longest waiting first when sorted by submission', () => {
      expect(titles(sortQueue([a, b, c], 'submittedAt'))).toEqual(['B', 'C', 'A']);
    });

    it('should sort numbers as numbers when descending', () => {
      expect(titles(sortQueue([a, b, c], '-requestedCoreHours'))).toEqual(['A', 'C', 'B']);
    });

    it('should put proposals without a mean score last in both directions', () => {
      expect(titles(sortQueue([a, b, c], 'meanScore'))).toEqual(['C', 'A', 'B']);
      expect(titles(sortQueue([a, b, c], '-meanScore'))).toEqual(['A', 'C', 'B']);
    });

    it('should sort by the share reviewed, unassigned proposals last, when sorted by progress', () => {
      expect(titles(sortQueue([a, b, c], 'reviewed'))).toEqual(['C', 'A', 'B']);
    });

    it('should not change the list it was given', () => {
      const list = [a, b, c];
      sortQueue(list, '-title');
      expect(titles(list)).toEqual(['A', 'B', 'C']);
    });
  });

  describe('queuePage', () => {
    it('should give the rows of the page asked for after sorting', () => {
      const items = ['E', 'B', 'D', 'A', 'C'].map((title) => item({ title }));
      expect(titles(queuePage(items, { page: 2, limit: 2, sort: 'title' }))).toEqual(['C', 'D']);
      expect(titles(queuePage(items, { page: 3, limit: 2, sort: 'title' }))).toEqual(['E']);
    });
  });

  describe('reviewProgress', () => {
    it('should count reviews against assignments when reviewers are assigned', () => {
      expect(reviewProgress({ assigned: 3, reviewed: 2, conflicts: 0 })).toEqual({ share: 2 / 3, text: '2 of 3 reviewed' });
    });

    it('should add the conflicts when members declared any', () => {
      expect(reviewProgress({ assigned: 2, reviewed: 2, conflicts: 1 }).text).toBe('2 of 2 reviewed · 1 conflict');
    });

    it('should say nobody is assigned yet when there are no assignments', () => {
      expect(reviewProgress({ assigned: 0, reviewed: 0, conflicts: 2 })).toEqual({ share: 0, text: 'No reviewer yet · 2 conflicts' });
    });
  });
});
