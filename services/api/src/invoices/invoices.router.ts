import { z } from 'zod';
import { IdParams, Invoice, InvoiceList, InvoiceListQuery, InvoiceRun, InvoiceRunInput, InvoiceRunList, PaymentLink, VoidInvoiceInput } from '@localis/shared';
import { access, defineRoutes } from '../http/route-registry';
import type { InvoicesService } from './invoices.service';
import type { StripeWebhook } from './stripe-webhook';
import { createInvoicesController } from './invoices.controller';

const BILLING = ['admin', 'billing'] as const;

export function invoicesRoutes(service: InvoicesService, webhook: StripeWebhook) {
  const c = createInvoicesController(service, webhook);
  return defineRoutes([
    {
      method: 'get', path: '/invoices', tag: 'billing', summary: "Invoices, newest first: all for the office, the institution's own for its billing contacts",
      access: access.read([...BILLING]), request: { query: InvoiceListQuery }, responses: { 200: { description: 'The invoices', schema: InvoiceList } }, handler: c.list,
    },
    {
      method: 'get', path: '/invoices/:id', tag: 'billing', summary: 'One invoice',
      access: access.read([...BILLING]), request: { params: IdParams }, responses: { 200: { description: 'The invoice', schema: Invoice } }, handler: c.get,
    },
    {
      method: 'get', path: '/invoices/:id/pdf', tag: 'billing', summary: "The issued invoice's PDF (a redirect to a download link valid for 15 minutes; a voided one's credit note)",
      access: access.read([...BILLING]), request: { params: IdParams }, responses: { 302: { description: 'To the PDF' } }, handler: c.pdf,
    },
    {
      method: 'get', path: '/invoice-runs', tag: 'billing', summary: 'Invoice runs, newest first (the office)',
      access: access.admin('read'), responses: { 200: { description: 'The runs', schema: InvoiceRunList } }, handler: c.runs,
    },
    {
      method: 'post', path: '/invoice-runs', tag: 'billing', summary: "Draft the partners' invoices of a period of whole months from the ledger (the worker runs it; running a period again adds only what is new)",
      access: access.admin(), request: { body: InvoiceRunInput }, responses: { 202: { description: 'Queued', schema: InvoiceRun } }, handler: c.requestRun,
    },
    {
      method: 'post', path: '/invoices/:id/issue', tag: 'billing', summary: 'Issue a draft: its number (no gaps in a year), due date, PDF and payment page; its billing contacts are e-mailed',
      access: access.admin(), request: { params: IdParams }, responses: { 200: { description: 'Issued', schema: Invoice } }, handler: c.issue,
    },
    {
      method: 'post', path: '/invoices/:id/void', tag: 'billing', summary: 'Void an invoice with a reason (an issued one gets a credit note); its usage can be billed again',
      access: access.admin(), request: { params: IdParams, body: VoidInvoiceInput }, responses: { 200: { description: 'Void', schema: Invoice } }, handler: c.void,
    },
    {
      method: 'post', path: '/invoices/:id/pay', tag: 'billing', summary: "The payment page of an issued invoice (Stripe's hosted page)",
      access: access.write([...BILLING]), request: { params: IdParams }, responses: { 200: { description: 'Where to pay', schema: PaymentLink } }, handler: c.pay,
    },
    {
      method: 'post', path: '/webhooks/stripe', tag: 'billing', summary: "Stripe's events, signed (Stripe-Signature); each event is processed once",
      access: access.public, csrf: false, idempotency: false, responses: { 200: { description: 'Received', schema: z.object({ received: z.literal(true) }) } }, handler: c.webhook,
    },
  ]);
}
