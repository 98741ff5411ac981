import type { Request, Response } from 'express';
import { contextOf } from '../http/principal';
import type { NotificationsService } from './notifications.service';

export function createNotificationsController(notifications: NotificationsService) {
  return {
    async list(req: Request, res: Response) {
      res.json(await notifications.list(contextOf(req), req.valid.query));
    },
    async markRead(req: Request, res: Response) {
      res.json(await notifications.markRead(contextOf(req), req.valid.body));
    },
    async mailPreferences(req: Request, res: Response) {
      res.json(await notifications.mailPreferences(contextOf(req)));
    },
    async updateMailPreferences(req: Request, res: Response) {
      res.json(await notifications.updateMailPreferences(contextOf(req), req.valid.body));
    },
  };
}
