// Failed sign-ins, kept in the database so that throttling holds across app servers.
import type { Tx } from '../db';

/** Failures in a window: how many, and the first and last of them (null when none). */
export interface FailureCount {
  count: number;
  first: Date | null;
  last: Date | null;
}

async function countSince(db: Tx, where: { email: string } | { ip: string }, since: Date): Promise<FailureCount> {
  const row = (await db('login_failures').where(where).andWhere('at', '>', since).count('* as count').min('at as first').max('at as last').first()) as
    { count: string | number; first: Date | null; last: Date | null } | undefined;
  return { count: Number(row?.count ?? 0), first: row?.first ? new Date(row.first) : null, last: row?.last ? new Date(row.last) : null };
}

/** Failures for one e-mail and for one client address since `since`. */
export async function countLoginFailures(db: Tx, email: string, ip: string, since: Date): Promise<{ byEmail: FailureCount; byIp: FailureCount }> {
  const [byEmail, byIp] = await Promise.all([countSince(db, { email }, since), countSince(db, { ip }, since)]);
  return { byEmail, byIp };
}

export async function recordLoginFailure(db: Tx, email: string, ip: string): Promise<void> {
  await db('login_failures').insert({ email, ip });
}

/** A successful sign-in forgets the account's failures (the address's stay, against spraying). */
export async function clearLoginFailures(db: Tx, email: string): Promise<void> {
  await db('login_failures').where({ email }).delete();
}
