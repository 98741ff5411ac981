import type { Request, Response } from 'express';
import { contextOf } from '../http/principal';
import type { InvoicesService } from './invoices.service';
import type { StripeWebhook } from './stripe-webhook';

export function createInvoicesController(service: InvoicesService, webhook: StripeWebhook) {
  const id = (req: Request) => req.valid.params.id as string;
  return {
    list: async (req: Request, res: Response) => res.json(await service.list(contextOf(req), req.valid.query)),
    get: async (req: Request, res: Response) => res.json(await service.get(contextOf(req), id(req))),
    pdf: async (req: Request, res: Response) => res.redirect(302, await service.pdfUrl(contextOf(req), id(req))),
    runs: async (_req: Request, res: Response) => res.json(await service.runs()),
    requestRun: async (req: Request, res: Response) => res.status(202).json(await service.requestRun(contextOf(req), req.valid.body)),
    issue: async (req: Request, res: Response) => res.json(await service.issue(contextOf(req), id(req))),
    void: async (req: Request, res: Response) => res.json(await service.void(contextOf(req), id(req), req.valid.body.reason)),
    pay: async (req: Request, res: Response) => res.json(await service.pay(contextOf(req), id(req))),
    webhook: async (req: Request, res: Response) => res.json(await webhook(Buffer.isBuffer(req.body) ? req.body : Buffer.alloc(0), req.get('stripe-signature'))),
  };
}
