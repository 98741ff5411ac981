import type { ApiToken } from '@localis/shared';

export type TokenState = 'active' | 'expired' | 'revoked';

export const TOKEN_STATE_LABELS: Record<TokenState, { label: string; severity: 'success' | 'warn' | 'secondary' }> = {
  active: { label: 'Active', severity: 'success' },
  expired: { label: 'Expired', severity: 'warn' },
  revoked: { label: 'Revoked', severity: 'secondary' },
};

/** Revoked wins over expired: a revoked token was stopped on purpose. */
export function tokenState(token: Pick<ApiToken, 'expiresAt' | 'revokedAt'>, now: Date = new Date()): TokenState {
  if (token.revokedAt) return 'revoked';
  if (new Date(token.expiresAt).getTime() <= now.getTime()) return 'expired';
  return 'active';
}
