import type { Transaction } from 'sequelize';
import type { Role } from '@localis/shared';
import { Institution, Person, RoleGrant } from '../db/models';

/** Active people holding a role (optionally of one institution): whom a billing mail goes to. */
async function emailsOf(role: Role, institutionId: string | undefined, tx?: Transaction): Promise<string[]> {
  const people = await Person.findAll({
    where: { active: true, ...(institutionId ? { institutionId } : {}) },
    attributes: ['email'],
    include: [{ model: RoleGrant, as: 'roleGrants', where: { role }, attributes: [] }],
    transaction: tx,
  });
  return people.map((p) => p.email);
}

/** A partner's billing contacts: its billing address and its people with the billing role. */
export async function billingAddressesOf(institutionId: string, tx?: Transaction): Promise<string[]> {
  const institution = await Institution.findByPk(institutionId, { transaction: tx });
  return [...new Set([...(institution?.billingEmail ? [institution.billingEmail] : []), ...(await emailsOf('billing', institutionId, tx))])];
}

/** The consortium office. */
export const officeAddresses = (tx?: Transaction) => emailsOf('admin', undefined, tx);
