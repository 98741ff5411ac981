import { IdParams, RateCard, RateCardInput, RateCardList } from '@localis/shared';
import { access, defineRoutes } from '../http/route-registry';
import type { RateCardsService } from './rate-cards.service';
import { createRateCardsController } from './rate-cards.controller';

export function rateCardsRoutes(service: RateCardsService) {
  const c = createRateCardsController(service);
  return defineRoutes([
    {
      method: 'get', path: '/institutions/:id/rate-cards', tag: 'billing', summary: "A partner's rate cards, newest first (the office and the partner's billing contacts)",
      access: access.read(['admin', 'billing']), request: { params: IdParams }, responses: { 200: { description: 'The rate cards', schema: RateCardList } }, handler: c.list,
    },
    {
      method: 'post', path: '/institutions/:id/rate-cards', tag: 'billing', summary: "A new rate card from a date on; it closes the one before (the office). Issued invoices keep the card they were priced with",
      access: access.admin(), request: { params: IdParams, body: RateCardInput }, responses: { 201: { description: 'Created', schema: RateCard } }, handler: c.create,
    },
  ]);
}
