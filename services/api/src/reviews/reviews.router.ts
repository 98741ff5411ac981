import { Assignment, AssignmentInput, Campaign, CampaignReviews, CommitteeQueue, CommitteeQueueQuery, ConflictInput, DecisionInput, IdParams, PoolUsage, ReviewInput, ReviewsIdParams } from '@localis/shared';
import { access, defineRoutes } from '../http/route-registry';
import type { ReviewsService } from './reviews.service';
import { createReviewsController } from './reviews.controller';

const READERS = ['researcher', 'pi', 'committee', 'admin'] as const;

export function reviewsRoutes(service: ReviewsService) {
  const c = createReviewsController(service);
  return defineRoutes([
    {
      method: 'get', path: '/committee/queue', tag: 'reviews', summary: 'Proposals before the committee: assigned to me (scope=mine) or all, with review progress',
      access: access.read(['committee', 'admin']), request: { query: CommitteeQueueQuery }, responses: { 200: { description: 'The queue', schema: CommitteeQueue } }, handler: c.queue,
    },
    {
      method: 'get', path: '/campaigns/:id/reviews', tag: 'reviews', summary: 'Assignments and reviews for the committee; for proposers, the feedback meant for them after the decision',
      access: access.read([...READERS]), request: { params: IdParams }, responses: { 200: { description: 'Reviews', schema: CampaignReviews } }, handler: c.forCampaign,
    },
    {
      method: 'post', path: '/campaigns/:id/assignments', tag: 'reviews', summary: "Assign a committee member to review a proposal (not from the proposers' institution)",
      access: access.admin(), request: { params: IdParams, body: AssignmentInput }, responses: { 201: { description: 'Assigned', schema: Assignment } }, handler: c.assign,
    },
    {
      method: 'delete', path: '/campaigns/:id/assignments/:assignmentId', tag: 'reviews', summary: 'Remove a reviewer who has not reviewed yet',
      access: access.admin(), request: { params: ReviewsIdParams }, responses: { 204: { description: 'Removed' } }, handler: c.unassign,
    },
    {
      method: 'post', path: '/campaigns/:id/conflict', tag: 'reviews', summary: 'Declare your own conflict of interest with a proposal (committee members)',
      access: access.write(['committee']), request: { params: IdParams, body: ConflictInput }, responses: { 200: { description: 'Declared', schema: Assignment } }, handler: c.declareConflict,
    },
    {
      method: 'put', path: '/campaigns/:id/assignments/:assignmentId/review', tag: 'reviews', summary: 'Write or revise your review of a proposal in review',
      access: access.write(['committee']), request: { params: ReviewsIdParams, body: ReviewInput }, responses: { 200: { description: 'Saved', schema: Assignment } }, handler: c.submitReview,
    },
    {
      method: 'get', path: '/campaigns/:id/pool', tag: 'reviews', summary: "The round's pool on the campaign's machine: granted, used, what is left to grant",
      access: access.read(['committee', 'admin']), request: { params: IdParams }, responses: { 200: { description: 'The pool', schema: PoolUsage } }, handler: c.pool,
    },
    {
      method: 'post', path: '/campaigns/:id/decision', tag: 'reviews', summary: "Grant all, part or none (never more than the pool has left), with a message to the proposers",
      access: access.admin(), request: { params: IdParams, body: DecisionInput }, responses: { 200: { description: 'Decided', schema: Campaign } }, handler: c.decide,
    },
  ]);
}
