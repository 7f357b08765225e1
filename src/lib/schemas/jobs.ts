// Background jobs: the field declaration, the JSON the API returns, and the list query.
import { z } from 'zod';
import { pageParams } from './params';
import { defineRecord, field, type JsonOf, type ValueOf } from './record';

export const JOB_STATES = ['queued', 'active', 'retry', 'completed', 'failed'] as const;
export type JobState = (typeof JOB_STATES)[number];

export const JobIdParamSchema = z.object({
  id: z.string({ required_error: 'Required' }).uuid('Not a job id'),
});

export const JobListQuerySchema = z.object({ ...pageParams });

/** Answer of POST /api/readings/import (202): the job that loads the staged rows. */
export interface ReadingsImportJson {
  job_id: string;
  import_id: string;
  rows: number;
}

export interface JobErrorJson {
  line: number;
  messages: string[];
}

/** A background job as people see it, field by field (pg-boss holds the work itself). */
export const JOB = defineRecord({
  id: field.id(),
  queue: field.value<string>(),
  owner_id: field.ref(),
  title: field.value<string>(),
  state: field.value<JobState>(),
  /** 0–100. */
  progress: field.value<number>(),
  phase: field.value<string | null>(),
  counts: field.value<Record<string, number>>(),
  /** Bad rows by line (at most 200 listed; error_count is exact). */
  errors: field.value<JobErrorJson[]>(),
  error_count: field.value<number>(),
  message: field.value<string | null>(),
  attempts: field.value<number>(),
  created_at: field.time(),
  started_at: field.maybeTime(),
  finished_at: field.maybeTime(),
});

export type JobRecord = ValueOf<typeof JOB.fields>;
export type JobJson = JsonOf<typeof JOB.fields>;
export const jobJson = (j: JobRecord): JobJson => JOB.toJson(j);
