// One replica for the two-process test: fires the week-post job once against a shared PostgreSQL and
// prints how it ended. Run by test/jobs/run-once.test.ts with node --import tsx.
import pg from 'pg';
import { PgRunOnceCoordinator } from '../../../src/jobs/run-once.ts';
import { startWeekPostJob } from '../../../src/jobs/week-post.ts';

const [url, schema, replica, firedAtText, startAtText] = process.argv.slice(2) as [
  string,
  string,
  string,
  string,
  string,
];
const pool = new pg.Pool({ connectionString: url, max: 2, options: `-c search_path=${schema}` });
const coordinator = new PgRunOnceCoordinator(pool, { replica });
await coordinator.ensureTable();
const job = startWeekPostJob(
  { post: 'fri 14:00', channel: 'C0DEMO01', zone: 'Europe/Lisbon' },
  {
    postWeekPlan: async (request) => {
      // The post itself: a row in a table both replicas can see, written slowly so the runs overlap.
      await new Promise((r) => setTimeout(r, 400));
      await pool.query('insert into posts (replica, iso_week) values ($1, $2)', [replica, request.isoWeek]);
    },
  },
  coordinator,
);
// Both replicas wait for the same instant, as two cron timers firing together would.
const startAt = Number(startAtText);
while (Date.now() < startAt) await new Promise((r) => setTimeout(r, 5));
const outcome = await job.fire(Number(firedAtText));
await job.stop();
await pool.end();
process.stdout.write(`${JSON.stringify({ replica, outcome })}\n`);
