import {
  CAMPAIGN_SCOPES,
  CAMPAIGN_STATE_LABELS,
  CAMPAIGN_STATES,
  CampaignListQuery,
  METHOD_LABELS,
  METHODS,
  SYMMETRY_CLASS_SIGNATURE,
  SYMMETRY_CLASSES,
  worksInGroups,
  type Role,
} from '@localis/shared';
import type { RouteLocationRaw } from 'vue-router';
import { fieldErrors } from '../../../composables/use-zod-form';
import { toLocationQuery, type TableQuerySpec } from '../../../composables/use-table-query';

/** The filters of the campaigns table, as they appear in the URL. */
export type CampaignFilter = 'scope' | 'q' | 'state' | 'roundId' | 'groupId' | 'method' | 'dimension' | 'symmetryClass';
export type CampaignFilters = Partial<Record<CampaignFilter, string>>;
export type CampaignScope = (typeof CAMPAIGN_SCOPES)[number];

export const CAMPAIGN_TABLE: TableQuerySpec<CampaignFilter> = {
  filters: ['scope', 'q', 'state', 'roundId', 'groupId', 'method', 'dimension', 'symmetryClass'],
  sortable: ['title', 'state', 'requestedCoreHours', 'createdAt', 'updatedAt', 'submittedAt', 'groupName', 'roundName'],
  defaultSort: '-updatedAt',
};

/** "All I can see" is the server's default, so it stays out of the address. */
export const DEFAULT_SCOPE: CampaignScope = 'all';

const SCOPE_LABELS: Record<CampaignScope, string> = { mine: 'Mine', 'my-groups': 'My groups', all: 'All I can see' };

/** The scope choice makes sense only to people in research groups; the committee and office see all. */
export function scopeOptions(roles: readonly Role[]): { label: string; value: CampaignScope }[] {
  return worksInGroups(roles) ? CAMPAIGN_SCOPES.map((s) => ({ label: SCOPE_LABELS[s], value: s })) : [];
}

export function scopeOf(filters: CampaignFilters): CampaignScope {
  return (CAMPAIGN_SCOPES as readonly string[]).includes(filters.scope ?? '') ? (filters.scope as CampaignScope) : DEFAULT_SCOPE;
}

/** What to put in the URL for a chosen scope: nothing for the default. */
export function scopeValue(scope: CampaignScope | null | undefined): string | null {
  return !scope || scope === DEFAULT_SCOPE ? null : scope;
}

export const STATE_OPTIONS = CAMPAIGN_STATES.map((s) => ({ label: CAMPAIGN_STATE_LABELS[s], value: s }));
export const METHOD_OPTIONS = METHODS.map((m) => ({ label: METHOD_LABELS[m], value: m }));
export const DIMENSION_OPTIONS = ['1', '2', '3'].map((d) => ({ label: `d = ${d}`, value: d }));
export const SYMMETRY_CLASS_OPTIONS = SYMMETRY_CLASSES.map((c) => ({ label: `${c} (${SYMMETRY_CLASS_SIGNATURE[c].name})`, value: c }));

/**
 * Filters the address holds that the api would refuse, by field, in the schema's own words; the
 * table then does not ask the server and says what is wrong instead.
 */
export function campaignQueryProblems(apiQuery: Record<string, unknown>): Record<string, string> {
  const result = CampaignListQuery.safeParse(apiQuery);
  return result.success ? {} : fieldErrors(result.error.issues);
}

/** A link to the campaigns table with these filters (home cards use it), plain where defaults hold. */
export function campaignsLink(filters: CampaignFilters, sort = CAMPAIGN_TABLE.defaultSort): RouteLocationRaw {
  const clean: CampaignFilters = { ...filters, scope: scopeValue(scopeOf(filters)) ?? undefined };
  return { name: 'campaigns', query: toLocationQuery({ page: 1, limit: 25, sort, filters: clean }, CAMPAIGN_TABLE) };
}
