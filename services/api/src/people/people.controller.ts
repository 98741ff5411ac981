import type { Request, Response } from 'express';
import type { Person } from '@localis/shared';
import { contextOf } from '../http/principal';
import { sendList } from '../http/send-list';
import type { PeopleService } from './people.service';

export function createPeopleController(people: PeopleService) {
  return {
    async list(req: Request, res: Response) {
      await sendList<Person, typeof req.valid.query>(res, req.valid.query, (q) => people.list(q), {
        filename: 'localis-people',
        columns: ['name', 'email', 'institutionName', 'roles', 'active', 'linked', 'lastSignInAt', 'createdAt', 'id'],
      });
    },
    async get(req: Request, res: Response) {
      res.json(await people.get(contextOf(req), req.valid.params.id));
    },
    async create(req: Request, res: Response) {
      res.status(201).json(await people.create(contextOf(req), req.valid.body));
    },
    async update(req: Request, res: Response) {
      res.json(await people.update(contextOf(req), req.valid.params.id, req.valid.body));
    },
    async grantRole(req: Request, res: Response) {
      res.json(await people.grantRole(contextOf(req), req.valid.params.id, req.valid.params.role));
    },
    async revokeRole(req: Request, res: Response) {
      res.json(await people.revokeRole(contextOf(req), req.valid.params.id, req.valid.params.role));
    },
  };
}
