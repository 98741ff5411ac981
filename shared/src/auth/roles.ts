import { z } from 'zod';

/** The five roles of the consortium. A person may hold several. */
export const ROLES = ['researcher', 'pi', 'committee', 'admin', 'billing'] as const;
export const Role = z.enum(ROLES).meta({ id: 'Role' });
export type Role = z.infer<typeof Role>;

export const ROLE_LABELS: Record<Role, { label: string; description: string }> = {
  researcher: { label: 'Researcher', description: 'Drafts campaigns, records runs, uploads result archives.' },
  pi: { label: 'PI', description: 'Leads a research group; submits proposals; sees group budgets.' },
  committee: { label: 'Committee', description: 'Reviews proposals and recommends core-hours.' },
  admin: { label: 'Consortium office', description: 'Rounds, grants, people, institutions, rate cards, invoices, audit.' },
  billing: { label: 'Billing contact', description: "Sees and pays the institution's invoices." },
};

/**
 * What a personal API token may do. A session has every scope its roles allow; a token only
 * the scopes it was created with, and never more than its owner's roles allow.
 */
export const TOKEN_SCOPES = ['read', 'write', 'runs', 'archives', 'admin'] as const;
export const TokenScope = z.enum(TOKEN_SCOPES).meta({ id: 'TokenScope' });
export type TokenScope = z.infer<typeof TokenScope>;

export const TOKEN_SCOPE_LABELS: Record<TokenScope, string> = {
  read: 'Read everything you can see',
  write: 'Change your own records (profile, campaigns)',
  runs: 'Record runs and import accounting data',
  archives: 'Upload result archives',
  admin: 'Administrative changes (admins only)',
};
