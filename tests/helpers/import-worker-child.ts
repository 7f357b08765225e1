// A second "app instance" for the restart test: works the readings-import queue and kills itself
// (SIGKILL, no clean-up) once the job is part-way through matching cells.
import knexFactory from 'knex';
import { createBoss, READINGS_IMPORT_QUEUE, startWorkers } from '../../src/lib/server/jobs/queue';
import { runReadingsImport } from '../../src/lib/server/readings-import';

const url = process.env.DATABASE_URL!;
const db = knexFactory({ client: 'pg', connection: url });
const boss = await createBoss(url);
await startWorkers(
  db,
  boss,
  {
    [READINGS_IMPORT_QUEUE]: (data, ctx) =>
      runReadingsImport(
        db,
        String(data.importId),
        {
          jobId: ctx.jobId,
          progress: async (p, phase, counts) => {
            await ctx.progress(p, phase, counts);
            if (p >= 30 && p < 90) process.kill(process.pid, 'SIGKILL');
          },
        },
        { batchRows: 500 },
      ),
  },
  { sweepSeconds: 0, pollingIntervalSeconds: 1 },
);
