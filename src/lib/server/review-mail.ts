// Mail about sightings: the submitter hears what became of their report (with the reviewer's
// reason), and reviewers hear that sightings wait — at most one message per reviewer per hour,
// kept in PostgreSQL so that several app servers share the limit.
import type { Knex } from 'knex';
import { sendMail, type OutgoingMail } from './mail';
import { mailHtml, mailText, type MailBlock } from './mail-layout';
import type { DecisionResult } from './repos/sighting-review';
import { STRUCTURE_TYPE_LABELS } from '../schemas/mast-enums';
import type { SightingStructureType } from '../schemas/sightings';
import { formatDate, formatQuantity } from '../domain/format';

/** Reviewers hear about waiting sightings at most this often (one message an hour). */
export const REVIEWER_ALERT_INTERVAL_MIN = 60;

function compose(to: string, subject: string, greeting: string, blocks: MailBlock[]): OutgoingMail {
  return { to, subject, text: mailText(greeting, blocks), html: mailHtml(greeting, blocks) };
}

const structureWord = (t: SightingStructureType) => (t === 'other' ? 'mast' : STRUCTURE_TYPE_LABELS[t].toLowerCase());
const day = formatDate;
const plural = (n: number, one: string, many = `${one}s`) => formatQuantity(n, one, many);

export function decisionMail(to: string, name: string, r: DecisionResult, origin: string): OutgoingMail {
  const s = r.sighting;
  const what = `your sighting of a ${structureWord(s.structureType)} on ${day(s.observedAt)}`;
  const blocks: MailBlock[] = [];
  let subject: string;
  if (s.status === 'approved') {
    subject = 'Your sighting is on the map';
    blocks.push({
      kind: 'p',
      text: `Good news: ${what} was approved. It is now on Bearline's map as a new mast, "${r.mast?.name}", with ${plural(r.addedCells.length, 'cell')} from your report.`,
    });
  } else if (s.status === 'merged') {
    subject = 'Your sighting confirmed a mast on the map';
    blocks.push({
      kind: 'p',
      text: `Thank you: ${what} matched a mast we already had, "${r.mast?.name}". Your report added ${plural(r.addedCells.length, 'new cell')} and confirmed ${plural(r.observedCells, 'cell')} we knew of${s.photos.length ? '; your photos are now with the mast' : ''}.`,
    });
  } else {
    subject = 'Your sighting was not added to the map';
    blocks.push({ kind: 'p', text: `Thank you for ${what}. A reviewer looked at it and did not add it to the map.` });
  }
  if (s.decisionReason) blocks.push({ kind: 'p', text: `The reviewer's note: ${s.decisionReason}` });
  blocks.push({
    kind: 'button',
    text: s.status === 'rejected' ? 'See your sightings' : 'Open the map',
    href: s.status === 'rejected' ? `${origin}/` : `${origin}/map`,
  });
  blocks.push({ kind: 'small', text: 'Stay on public ground when you report a mast: never climb or enter a site, and keep well clear of power lines.' });
  return compose(to, subject, `Hello ${name},`, blocks);
}

/** Tells the submitter what became of their sighting. A mail failure is logged, never undoes the decision. */
export async function notifySubmitter(db: Knex, r: DecisionResult, origin: string): Promise<boolean> {
  const author = (await db('users').where({ id: r.sighting.author.id }).first('email', 'name', 'disabled_at')) as
    { email: string; name: string; disabled_at: Date | null } | undefined;
  if (!author || author.disabled_at) return false;
  try {
    await sendMail(decisionMail(author.email, author.name, r, origin));
    return true;
  } catch (err) {
    console.error('[bearline] decision mail not sent', err instanceof Error ? err.message : err);
    return false;
  }
}

export function waitingMail(to: string, name: string, waiting: number, oldest: Date, origin: string): OutgoingMail {
  return compose(to, `${plural(waiting, 'sighting')} waiting for review`, `Hello ${name},`, [
    {
      kind: 'p',
      text: `${plural(waiting, 'sighting')} from the field ${waiting === 1 ? 'waits' : 'wait'} for review in Bearline. The oldest arrived on ${day(oldest)}.`,
    },
    { kind: 'button', text: 'Open the review queue', href: `${origin}/review` },
    { kind: 'small', text: `You get at most one of these messages an hour.` },
  ]);
}

/**
 * Mails each active reviewer whose last alert is over an hour old (or who never had one) when a
 * sighting arrived since that alert. The row is claimed with one conditional upsert, so two app
 * servers running this at once send one message. Returns the addresses mailed.
 */
export async function alertReviewers(db: Knex, origin: string, now = new Date()): Promise<string[]> {
  const pending = (await db('sightings').where({ status: 'pending' }).count<{ n: string }[]>('* as n').min('created_at as oldest').first()) as unknown as {
    n: string;
    oldest: Date | null;
  };
  const waiting = Number(pending?.n ?? 0);
  if (waiting === 0 || !pending.oldest) return [];
  const cutoff = new Date(now.getTime() - REVIEWER_ALERT_INTERVAL_MIN * 60_000);
  const claimed = (await db.raw(
    `INSERT INTO reviewer_alerts (user_id, last_sent_at)
       SELECT u.id, ? FROM users u WHERE u.role = 'reviewer' AND u.disabled_at IS NULL
     ON CONFLICT (user_id) DO UPDATE SET last_sent_at = EXCLUDED.last_sent_at
       WHERE reviewer_alerts.last_sent_at <= ?
         AND EXISTS (SELECT 1 FROM sightings s WHERE s.status = 'pending' AND s.created_at > reviewer_alerts.last_sent_at)
     RETURNING user_id`,
    [now, cutoff],
  )) as { rows: Array<{ user_id: string }> };
  if (claimed.rows.length === 0) return [];
  const people = (await db('users')
    .whereIn(
      'id',
      claimed.rows.map((r) => r.user_id),
    )
    .select('email', 'name')) as Array<{ email: string; name: string }>;
  const sent: string[] = [];
  for (const p of people) {
    try {
      await sendMail(waitingMail(p.email, p.name, waiting, pending.oldest, origin));
      sent.push(p.email);
    } catch (err) {
      console.error('[bearline] reviewer alert not sent', err instanceof Error ? err.message : err);
    }
  }
  return sent;
}
