import type { Job } from 'bullmq';
import type { Redis } from 'ioredis';
import type { Logger } from 'pino';
import type { z } from 'zod';
import type { Settings } from '@localis/shared';
import type { Database } from '@localis/api/db';

export interface JobDeps {
  settings: Settings;
  db: Database;
  redis: Redis;
  logger: Logger;
}

/** A worker job: its queue name, the schema of its data, and what it does (idempotently). */
export interface JobDefinition<S extends z.ZodType = z.ZodType> {
  name: string;
  schema: S;
  /** Jobs of this queue run at once in one worker (default 4). */
  concurrency?: number;
  process(data: z.infer<S>, deps: JobDeps, job: Job): Promise<unknown>;
}
