import type { Request, Response } from 'express';
import { contextOf } from '../http/principal';
import type { RateCardsService } from './rate-cards.service';

export function createRateCardsController(service: RateCardsService) {
  const id = (req: Request) => req.valid.params.id as string;
  return {
    list: async (req: Request, res: Response) => res.json(await service.list(contextOf(req), id(req))),
    create: async (req: Request, res: Response) => res.status(201).json(await service.create(contextOf(req), id(req), req.valid.body)),
  };
}
