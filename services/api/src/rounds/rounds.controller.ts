import type { Request, Response } from 'express';
import { contextOf } from '../http/principal';
import { sendList } from '../http/send-list';
import type { RoundsService } from './rounds.service';

export function createRoundsController(service: RoundsService) {
  return {
    list: (req: Request, res: Response) =>
      sendList(res, req.valid.query, (q) => service.list(q), {
        filename: 'localis-rounds',
        columns: ['id', 'name', 'status', 'opensAt', 'closesAt', 'totalCoreHours', 'campaignCount'],
      }),
    get: async (req: Request, res: Response) => res.json(await service.get(req.valid.params.id)),
    create: async (req: Request, res: Response) => res.status(201).json(await service.create(contextOf(req), req.valid.body)),
    update: async (req: Request, res: Response) => res.json(await service.update(contextOf(req), req.valid.params.id, req.valid.body)),
  };
}
