import type { Request, Response } from 'express';
import { contextOf } from '../http/principal';
import type { LedgerService } from './ledger.service';

export function createLedgerController(service: LedgerService) {
  const id = (req: Request) => req.valid.params.id as string;
  return {
    get: async (req: Request, res: Response) => res.json(await service.get(contextOf(req), id(req))),
    adjust: async (req: Request, res: Response) => res.status(201).json(await service.adjust(contextOf(req), id(req), req.valid.body)),
    transfer: async (req: Request, res: Response) => res.status(201).json(await service.transfer(contextOf(req), id(req), req.valid.body)),
    refund: async (req: Request, res: Response) => res.status(201).json(await service.refund(contextOf(req), id(req), req.valid.body)),
    roundUsage: async (req: Request, res: Response) => res.json(await service.roundUsage(id(req))),
  };
}
