import type { Request, Response } from 'express';
import { contextOf } from '../http/principal';
import type { TokensService } from './tokens.service';

export function createTokensController(tokens: TokensService) {
  return {
    async list(req: Request, res: Response) {
      res.json({ items: await tokens.list(contextOf(req)) });
    },
    async create(req: Request, res: Response) {
      res.status(201).set('Cache-Control', 'no-store').json(await tokens.create(contextOf(req), req.valid.body));
    },
    async revoke(req: Request, res: Response) {
      await tokens.revoke(contextOf(req), req.valid.params.id);
      res.status(204).end();
    },
  };
}
