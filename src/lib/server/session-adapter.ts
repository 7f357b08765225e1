// Lucia v3 adapter over Knex, so every query goes through Knex.
import type { Adapter, DatabaseSession, DatabaseUser } from 'lucia';
import type { Knex } from 'knex';

export class KnexSessionAdapter implements Adapter {
  constructor(private readonly db: () => Knex) {}

  async getSessionAndUser(sessionId: string): Promise<[DatabaseSession | null, DatabaseUser | null]> {
    const row = await this.db()('sessions as s')
      .join('users as u', 'u.id', 's.user_id')
      .where('s.id', sessionId)
      .first('s.id as session_id', 's.expires_at', 'u.id', 'u.email', 'u.name', 'u.role', 'u.disabled_at');
    if (!row) return [null, null];
    const session: DatabaseSession = { id: row.session_id, userId: String(row.id), expiresAt: new Date(row.expires_at), attributes: {} };
    const user: DatabaseUser = {
      id: String(row.id),
      attributes: { email: row.email, name: row.name, role: row.role, disabled_at: row.disabled_at },
    };
    return [session, user];
  }

  async getUserSessions(userId: string): Promise<DatabaseSession[]> {
    const rows = await this.db()('sessions').where({ user_id: userId });
    return rows.map((r) => ({ id: r.id, userId: String(r.user_id), expiresAt: new Date(r.expires_at), attributes: {} }));
  }

  async setSession(session: DatabaseSession): Promise<void> {
    await this.db()('sessions').insert({ id: session.id, user_id: session.userId, expires_at: session.expiresAt });
  }

  async updateSessionExpiration(sessionId: string, expiresAt: Date): Promise<void> {
    await this.db()('sessions').where({ id: sessionId }).update({ expires_at: expiresAt });
  }

  async deleteSession(sessionId: string): Promise<void> {
    await this.db()('sessions').where({ id: sessionId }).delete();
  }

  async deleteUserSessions(userId: string): Promise<void> {
    await this.db()('sessions').where({ user_id: userId }).delete();
  }

  async deleteExpiredSessions(): Promise<void> {
    await this.db()('sessions').where('expires_at', '<=', new Date()).delete();
  }
}
