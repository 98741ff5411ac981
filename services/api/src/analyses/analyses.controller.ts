import type { Request, Response } from 'express';
import { contextOf } from '../http/principal';
import type { AnalysesService } from './analyses.service';

export function createAnalysesController(service: AnalysesService) {
  const id = (req: Request) => req.valid.params.id as string;
  return {
    list: async (req: Request, res: Response) => res.json(await service.list(contextOf(req), id(req))),
    get: async (req: Request, res: Response) => res.json(await service.get(contextOf(req), id(req))),
    request: async (req: Request, res: Response) => res.status(202).json(await service.request(contextOf(req), id(req), req.valid.body)),
  };
}
