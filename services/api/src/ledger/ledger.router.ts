import { z } from 'zod';
import { AdjustmentInput, IdParams, Ledger, LedgerEntry, RefundInput, RoundUsage, TransferInput } from '@localis/shared';
import { access, defineRoutes } from '../http/route-registry';
import type { LedgerService } from './ledger.service';
import { createLedgerController } from './ledger.controller';

const READERS = ['researcher', 'pi', 'committee', 'admin'] as const;

export function ledgerRoutes(service: LedgerService) {
  const c = createLedgerController(service);
  return defineRoutes([
    {
      method: 'get', path: '/campaigns/:id/ledger', tag: 'ledger', summary: 'Granted, used and remaining core-hours with every ledger entry (oldest first)',
      access: access.read([...READERS]), request: { params: IdParams }, responses: { 200: { description: 'The ledger', schema: Ledger } }, handler: c.get,
    },
    {
      method: 'post', path: '/campaigns/:id/ledger/adjustments', tag: 'ledger', summary: 'Add or take core-hours with a reason (the office; additions come out of the pool)',
      access: access.admin(), request: { params: IdParams, body: AdjustmentInput }, responses: { 201: { description: 'The entry', schema: LedgerEntry } }, handler: c.adjust,
    },
    {
      method: 'post', path: '/campaigns/:id/ledger/transfers', tag: 'ledger', summary: "Move core-hours to another campaign of the group in the same pool (the group's PI or the office)",
      access: access.write(['pi', 'admin']), request: { params: IdParams, body: TransferInput },
      responses: { 201: { description: 'Both entries', schema: z.object({ from: LedgerEntry, to: LedgerEntry }).meta({ id: 'TransferResult' }) } }, handler: c.transfer,
    },
    {
      method: 'post', path: '/campaigns/:id/ledger/refunds', tag: 'ledger', summary: "Give back a run's core-hours, all or part, with a reason (the office)",
      access: access.admin(), request: { params: IdParams, body: RefundInput }, responses: { 201: { description: 'The entry', schema: LedgerEntry } }, handler: c.refund,
    },
    {
      method: 'get', path: '/rounds/:id/usage', tag: 'ledger', summary: "The round's pools: granted, used and remaining by group and machine",
      access: access.read(['committee', 'admin']), request: { params: IdParams }, responses: { 200: { description: 'Usage', schema: RoundUsage } }, handler: c.roundUsage,
    },
  ]);
}
