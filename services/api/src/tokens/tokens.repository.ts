import { Op, type Transaction } from 'sequelize';
import type { ApiToken as ApiTokenDto, TokenScope } from '@localis/shared';
import { ApiToken } from '../db/models';

function toDto(t: ApiToken): ApiTokenDto {
  return {
    id: t.id,
    name: t.name,
    prefix: t.prefix,
    scopes: t.scopes,
    expiresAt: t.expiresAt.toISOString(),
    lastUsedAt: t.lastUsedAt?.toISOString() ?? null,
    revokedAt: t.revokedAt?.toISOString() ?? null,
    createdAt: t.createdAt.toISOString(),
  };
}

export interface TokenRecord {
  id: string;
  personId: string;
  scopes: TokenScope[];
  expiresAt: Date;
  revokedAt: Date | null;
  lastUsedAt: Date | null;
}

export const tokensRepository = {
  async create(row: { personId: string; name: string; tokenHash: string; prefix: string; scopes: TokenScope[]; expiresAt: Date }, tx?: Transaction) {
    return toDto(await ApiToken.create({ ...row, lastUsedAt: null, revokedAt: null }, { transaction: tx }));
  },

  async listFor(personId: string): Promise<ApiTokenDto[]> {
    return (await ApiToken.findAll({ where: { personId }, order: [['createdAt', 'DESC']] })).map(toDto);
  },

  async find(id: string, tx?: Transaction): Promise<(ApiTokenDto & { personId: string }) | null> {
    const t = await ApiToken.findByPk(id, { transaction: tx });
    return t ? { ...toDto(t), personId: t.personId } : null;
  },

  async findByHash(tokenHash: string): Promise<TokenRecord | null> {
    const t = await ApiToken.findOne({ where: { tokenHash } });
    return t ? { id: t.id, personId: t.personId, scopes: t.scopes, expiresAt: t.expiresAt, revokedAt: t.revokedAt, lastUsedAt: t.lastUsedAt } : null;
  },

  async revoke(id: string, tx?: Transaction): Promise<void> {
    await ApiToken.update({ revokedAt: new Date() }, { where: { id, revokedAt: { [Op.is]: null } }, transaction: tx });
  },

  async touch(id: string): Promise<void> {
    await ApiToken.update({ lastUsedAt: new Date() }, { where: { id } });
  },
};
