import type { Request, Response } from 'express';
import { contextOf } from '../http/principal';
import type { GroupsService } from './groups.service';

export function createGroupsController(service: GroupsService) {
  return {
    list: async (req: Request, res: Response) => res.json(await service.list(contextOf(req), req.valid.query)),
    get: async (req: Request, res: Response) => res.json(await service.get(contextOf(req), req.valid.params.id)),
    create: async (req: Request, res: Response) => res.status(201).json(await service.create(contextOf(req), req.valid.body)),
    addMember: async (req: Request, res: Response) => res.json(await service.addMember(contextOf(req), req.valid.params.id, req.valid.body.personId)),
    removeMember: async (req: Request, res: Response) => res.json(await service.removeMember(contextOf(req), req.valid.params.id, req.valid.params.personId)),
  };
}
