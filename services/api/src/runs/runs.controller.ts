import type { Request, Response } from 'express';
import { contextOf } from '../http/principal';
import { sendList } from '../http/send-list';
import type { RunsService } from './runs.service';

export function createRunsController(service: RunsService) {
  const id = (req: Request) => req.valid.params.id as string;
  return {
    list: (req: Request, res: Response) =>
      sendList(res, req.valid.query, (q) => service.list(contextOf(req), id(req), q), {
        filename: 'localis-runs',
        columns: ['id', 'externalJobId', 'machine', 'startedAt', 'endedAt', 'cores', 'coreHours', 'refundedCoreHours', 'codeName', 'codeVersion', 'parameters', 'source', 'recordedByName', 'createdAt'],
      }),
    create: async (req: Request, res: Response) => res.status(201).json(await service.create(contextOf(req), id(req), req.valid.body)),
    importRuns: async (req: Request, res: Response) => {
      const dryRun = req.valid.query.dryRun as boolean;
      res.status(dryRun ? 200 : 201).json(await service.importRuns(contextOf(req), id(req), req.valid.body, dryRun));
    },
  };
}
