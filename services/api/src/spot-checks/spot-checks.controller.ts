import type { Request, Response } from 'express';
import { contextOf } from '../http/principal';
import type { SpotChecksService } from './spot-checks.service';

export function createSpotChecksController(service: SpotChecksService) {
  return {
    list: async (req: Request, res: Response) => res.json(await service.list(contextOf(req), req.valid.params.id as string)),
  };
}
