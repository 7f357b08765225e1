// Background jobs: the JSON the API returns, and the list query.
import { z } from 'zod';
import { pageParams } from './params';

export const JOB_STATES = ['queued', 'active', 'retry', 'completed', 'failed'] as const;
export type JobState = (typeof JOB_STATES)[number];

export const JobIdParamSchema = z.object({
  id: z.string({ required_error: 'Required' }).uuid('Not a job id'),
});

export const JobListQuerySchema = z.object({ ...pageParams });

export interface JobErrorJson {
  line: number;
  messages: string[];
}

export interface JobJson {
  id: string;
  queue: string;
  owner_id: string | null;
  title: string;
  state: JobState;
  /** 0–100. */
  progress: number;
  phase: string | null;
  counts: Record<string, number>;
  /** Bad rows by line (at most 200 listed; error_count is exact). */
  errors: JobErrorJson[];
  error_count: number;
  message: string | null;
  attempts: number;
  created_at: string;
  started_at: string | null;
  finished_at: string | null;
}
