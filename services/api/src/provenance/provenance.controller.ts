import type { Request, Response } from 'express';
import { contextOf } from '../http/principal';
import type { ProvenanceService } from './provenance.service';

export function createProvenanceController(service: ProvenanceService, archiveIdOf: (sha256: string) => Promise<string | null>) {
  return {
    head: async (_req: Request, res: Response) => res.json(await service.latestHead()),
    key: (_req: Request, res: Response) => res.json(service.key()),
    entry: async (req: Request, res: Response) => res.json(await service.entry(req.valid.params.index, req.valid.query.treeSize)),
    consistency: async (req: Request, res: Response) => res.json(await service.consistency(req.valid.query.from, req.valid.query.to)),
    byArchiveSha256: async (req: Request, res: Response) => res.json(await service.byArchiveSha256(contextOf(req), req.valid.params.sha256, archiveIdOf)),
    ofCampaign: async (req: Request, res: Response) => {
      const format = req.valid.query.format as 'entries' | 'prov-json';
      const body = await service.ofCampaign(contextOf(req), req.valid.params.id, format);
      if (format === 'prov-json') {
        res.type('application/json');
        res.setHeader('Content-Disposition', `attachment; filename="localis-provenance-${req.valid.params.id}.prov.json"`);
      }
      res.json(body);
    },
  };
}
