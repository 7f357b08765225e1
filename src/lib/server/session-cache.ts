// Validated sessions kept in memory for a few seconds, so a burst of requests (a map full of tiles)
// costs one session lookup instead of one each. An entry is trusted only while the change feed is
// live, no write happened on this machine since it was made (sign-out, role change and disabling
// are writes: write-epoch.ts), and no session or user changed anywhere (the feed's sessions
// notification): otherwise the session is read from the database again, as without the cache.
import type { Session, User } from 'lucia';
import { lucia } from './auth';
import { getChangeFeed } from './change-feed';
import { currentWriteEpoch } from './write-epoch';

/** How long a validated session is used without asking the database. */
export const SESSION_CACHE_MS = 10_000;
const MAX_ENTRIES = 5_000;

interface Entry {
  session: Session;
  user: User;
  until: number;
  epoch: string;
  generation: number;
}

const entries = new Map<string, Entry>();

export type SessionCheck = { session: Session; user: User } | { session: null; user: null };

/** lucia.validateSession, answered from memory while that is known to be safe. */
export async function validateSessionCached(sessionId: string): Promise<SessionCheck> {
  const feed = getChangeFeed();
  const epoch = currentWriteEpoch();
  const now = Date.now();
  if (feed?.isLive) {
    const hit = entries.get(sessionId);
    if (hit && hit.until > now && hit.epoch === epoch && hit.generation === feed.sessionsGeneration) {
      return { session: { ...hit.session, fresh: false }, user: hit.user };
    }
  }
  const generation = feed?.sessionsGeneration ?? 0;
  const result = await lucia.validateSession(sessionId);
  if (feed?.isLive && result.session && !result.session.fresh) {
    if (entries.size >= MAX_ENTRIES) entries.clear();
    // Never past the session's own expiry.
    const until = Math.min(now + SESSION_CACHE_MS, result.session.expiresAt.getTime());
    entries.set(sessionId, { session: result.session, user: result.user, until, epoch, generation });
  } else {
    entries.delete(sessionId);
  }
  return result;
}
