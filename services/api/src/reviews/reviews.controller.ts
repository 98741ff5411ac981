import type { Request, Response } from 'express';
import { contextOf } from '../http/principal';
import type { ReviewsService } from './reviews.service';

export function createReviewsController(service: ReviewsService) {
  const id = (req: Request) => req.valid.params.id as string;
  return {
    queue: async (req: Request, res: Response) => res.json(await service.queue(contextOf(req), req.valid.query)),
    forCampaign: async (req: Request, res: Response) => res.json(await service.forCampaign(contextOf(req), id(req))),
    assign: async (req: Request, res: Response) => res.status(201).json(await service.assign(contextOf(req), id(req), req.valid.body.reviewerPersonId)),
    unassign: async (req: Request, res: Response) => {
      await service.unassign(contextOf(req), id(req), req.valid.params.assignmentId);
      res.status(204).end();
    },
    declareConflict: async (req: Request, res: Response) => res.json(await service.declareConflict(contextOf(req), id(req), req.valid.body.reason)),
    submitReview: async (req: Request, res: Response) => res.json(await service.submitReview(contextOf(req), id(req), req.valid.params.assignmentId, req.valid.body)),
    pool: async (req: Request, res: Response) => res.json(await service.pool(contextOf(req), id(req))),
    decide: async (req: Request, res: Response) => res.json(await service.decide(contextOf(req), id(req), req.valid.body)),
  };
}
