import { describe, expect, it } from 'vitest';
import { parseTableQuery, toApiQuery, toLocationQuery } from '../../../composables/use-table-query';
import {
  CAMPAIGN_TABLE,
  campaignQueryProblems,
  campaignsLink,
  scopeOf,
  scopeOptions,
  scopeValue,
} from './campaign-filter';

const ROUND = '7c1e2d3f-4a5b-4c6d-8e9f-0a1b2c3d4e5f';

describe('campaign-filter', () => {
  describe('URL -> table state', () => {
    it('should read every filter, the sort and the page when the address carries them', () => {
      const state = parseTableQuery(
        { scope: 'mine', state: 'draft', roundId: ROUND, method: 'transfer-matrix', dimension: '3', symmetryClass: 'AII', q: 'critical', sort: '-requestedCoreHours', page: '2' },
        CAMPAIGN_TABLE,
      );
      expect(state.filters).toEqual({ scope: 'mine', state: 'draft', roundId: ROUND, method: 'transfer-matrix', dimension: '3', symmetryClass: 'AII', q: 'critical' });
      expect(state.sort).toBe('-requestedCoreHours');
      expect(state.page).toBe(2);
    });

    it('should fall back to newest-updated first when the sort names no sortable column', () => {
      expect(parseTableQuery({ sort: 'peakMemoryBytes' }, CAMPAIGN_TABLE).sort).toBe('-updatedAt');
    });
  });

  describe('table state -> URL and api', () => {
    it('should keep the address plain when only defaults are set', () => {
      expect(toLocationQuery({ page: 1, limit: 25, sort: '-updatedAt', filters: {} }, CAMPAIGN_TABLE)).toEqual({});
    });

    it('should round-trip the filters through the address when they are set', () => {
      const state = { page: 3, limit: 50, sort: 'title', filters: { scope: 'my-groups', state: 'submitted', dimension: '2' } };
      expect(parseTableQuery(toLocationQuery(state, CAMPAIGN_TABLE) as never, CAMPAIGN_TABLE)).toEqual(state);
    });

    it('should send the filters with limit, offset and sort when asking the api', () => {
      expect(toApiQuery({ page: 2, limit: 25, sort: '-updatedAt', filters: { state: 'draft', scope: 'mine' } })).toEqual({
        state: 'draft',
        scope: 'mine',
        limit: 25,
        offset: 25,
        sort: '-updatedAt',
      });
    });
  });

  describe('scope', () => {
    it('should offer Mine, My groups and All when the person works in groups', () => {
      expect(scopeOptions(['researcher']).map((o) => o.label)).toEqual(['Mine', 'My groups', 'All I can see']);
    });

    it('should offer no scope when the person only reviews or runs the office', () => {
      expect(scopeOptions(['committee', 'admin'])).toEqual([]);
    });

    it('should read an unknown scope as all, and leave all out of the address', () => {
      expect(scopeOf({ scope: 'everyone' })).toBe('all');
      expect(scopeOf({ scope: 'my-groups' })).toBe('my-groups');
      expect(scopeValue('all')).toBeNull();
      expect(scopeValue('mine')).toBe('mine');
    });
  });

  describe('campaignQueryProblems', () => {
    it('should find nothing wrong when the filters are ones the api accepts', () => {
      expect(campaignQueryProblems({ scope: 'mine', state: 'draft', dimension: '3', limit: 25, offset: 0, sort: '-updatedAt' })).toEqual({});
    });

    it('should name the field when the address holds a filter the api would refuse', () => {
      const problems = campaignQueryProblems({ state: 'approved', roundId: 'r1', dimension: '4', limit: 25, offset: 0, sort: '-updatedAt' });
      expect(Object.keys(problems).sort()).toEqual(['dimension', 'roundId', 'state']);
      expect(problems.dimension).toBe('dimension must be 1, 2 or 3');
    });
  });

  describe('campaignsLink', () => {
    it('should link to the table with the filters in the query when a home card asks', () => {
      expect(campaignsLink({ scope: 'mine', state: 'draft' })).toEqual({ name: 'campaigns', query: { scope: 'mine', state: 'draft' } });
      expect(campaignsLink({ scope: 'all', state: 'submitted' }, 'submittedAt')).toEqual({
        name: 'campaigns',
        query: { state: 'submitted', sort: 'submittedAt' },
      });
    });
  });
});
