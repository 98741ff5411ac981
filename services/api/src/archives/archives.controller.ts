import type { Request, Response } from 'express';
import { contextOf } from '../http/principal';
import type { ArchivesService } from './archives.service';

export function createArchivesController(service: ArchivesService) {
  const id = (req: Request) => req.valid.params.id as string;
  return {
    create: async (req: Request, res: Response) => res.status(201).json(await service.create(contextOf(req), id(req), req.valid.body)),
    list: async (req: Request, res: Response) => res.json(await service.list(contextOf(req), id(req))),
    get: async (req: Request, res: Response) => res.json(await service.get(contextOf(req), id(req))),
    storedParts: async (req: Request, res: Response) => res.json(await service.storedParts(contextOf(req), id(req))),
    partUrls: async (req: Request, res: Response) => res.json(await service.partUrls(contextOf(req), id(req), req.valid.body.partNumbers)),
    complete: async (req: Request, res: Response) => res.json(await service.complete(contextOf(req), id(req), req.valid.body.sha256)),
    cancel: async (req: Request, res: Response) => res.json(await service.cancel(contextOf(req), id(req))),
    download: async (req: Request, res: Response) => res.json(await service.download(contextOf(req), id(req))),
    withdraw: async (req: Request, res: Response) => res.json(await service.withdraw(contextOf(req), id(req), req.valid.body.reason)),
  };
}
