import type { Request, Response } from 'express';
import { contextOf } from '../http/principal';
import { sendList } from '../http/send-list';
import type { CampaignsService } from './campaigns.service';

export function createCampaignsController(service: CampaignsService) {
  const note = (req: Request) => (req.valid.body?.note as string | undefined) || null;
  return {
    estimate: (req: Request, res: Response) => res.json(service.estimate(req.valid.body)),
    list: (req: Request, res: Response) =>
      sendList(res, req.valid.query, (q) => service.list(contextOf(req), q), {
        filename: 'localis-campaigns',
        columns: ['id', 'title', 'state', 'groupName', 'institutionName', 'roundName', 'machine', 'ownerName', 'method', 'dimension', 'symmetryClass', 'requestedCoreHours', 'peakMemoryBytes', 'warningCount', 'createdAt', 'updatedAt', 'submittedAt'],
      }),
    get: async (req: Request, res: Response) => res.json(await service.get(contextOf(req), req.valid.params.id)),
    create: async (req: Request, res: Response) => res.status(201).json(await service.create(contextOf(req), req.valid.body)),
    update: async (req: Request, res: Response) => res.json(await service.update(contextOf(req), req.valid.params.id, req.valid.body)),
    submit: async (req: Request, res: Response) => res.json(await service.submit(contextOf(req), req.valid.params.id, note(req))),
    withdraw: async (req: Request, res: Response) => res.json(await service.withdraw(contextOf(req), req.valid.params.id, note(req))),
    startReview: async (req: Request, res: Response) => res.json(await service.startReview(contextOf(req), req.valid.params.id, note(req))),
  };
}
