import type { Settings } from '@localis/shared';
import type { Database } from './db';
import { createGroupsService } from './groups/groups.service';
import { createInstitutionsService } from './institutions/institutions.service';
import { createPeopleService } from './people/people.service';
import { createSignInService } from './auth/sign-in.service';
import { createTokensService } from './tokens/tokens.service';
import { createRoundsService } from './rounds/rounds.service';
import { createCampaignsService } from './campaigns/campaigns.service';
import { createLedgerService } from './ledger/ledger.service';
import { createRunsService } from './runs/runs.service';
import { createReviewsService } from './reviews/reviews.service';
import { createNotificationsService } from './notifications/notifications.service';
import { createArchivesService } from './archives/archives.service';
import { createObjectStore } from './archives/object-store';
import { createProvenanceService } from './provenance/provenance.service';
import { createAnalysesService } from './analyses/analyses.service';
import { createSpotChecksService } from './spot-checks/spot-checks.service';
import { createRateCardsService } from './rate-cards/rate-cards.service';
import { createStripeClient } from './billing/stripe-client';
import { createInvoicePayments } from './invoices/invoice-payments';
import { createInvoicesService } from './invoices/invoices.service';
import { createStripeWebhook } from './invoices/stripe-webhook';

/** The composition root of the rules: seeds, the api and the worker all go through these. */
export function createServices(db: Database, s: Settings) {
  const campaigns = createCampaignsService(db);
  const ledger = createLedgerService(db, campaigns);
  const objectStore = createObjectStore(s);
  const stripe = createStripeClient(s);
  const invoicePayments = createInvoicePayments(db, s, objectStore, stripe);
  return {
    people: createPeopleService(db, s.PUBLIC_URL),
    institutions: createInstitutionsService(db),
    groups: createGroupsService(db),
    tokens: createTokensService(db),
    signIn: createSignInService(db),
    rounds: createRoundsService(db),
    campaigns,
    ledger,
    runs: createRunsService(db, campaigns, ledger),
    reviews: createReviewsService(db, campaigns, ledger),
    notifications: createNotificationsService(db),
    objectStore,
    archives: createArchivesService(db, objectStore, campaigns),
    provenance: createProvenanceService(db, s, campaigns),
    analyses: createAnalysesService(db, campaigns),
    spotChecks: createSpotChecksService(campaigns),
    rateCards: createRateCardsService(db),
    invoicePayments,
    invoices: createInvoicesService(db, invoicePayments),
    stripeWebhook: createStripeWebhook(db, stripe, s.STRIPE_WEBHOOK_SECRET),
  };
}
export type Services = ReturnType<typeof createServices>;

export { auditService, SYSTEM_CONTEXT } from './audit/audit.service';
export { openDatabase } from './db';
