import type { Request, Response } from 'express';
import { contextOf } from '../http/principal';
import type { InstitutionsService } from './institutions.service';

export function createInstitutionsController(service: InstitutionsService) {
  return {
    list: async (req: Request, res: Response) => res.json(await service.list(contextOf(req), req.valid.query)),
    get: async (req: Request, res: Response) => res.json(await service.get(contextOf(req), req.valid.params.id)),
    create: async (req: Request, res: Response) => res.status(201).json(await service.create(contextOf(req), req.valid.body)),
    update: async (req: Request, res: Response) => res.json(await service.update(contextOf(req), req.valid.params.id, req.valid.body)),
  };
}
