import "server-only";
/**
 * Lucia's session storage on PostgreSQL, through Knex, on the same `sessions` table the SQLite
 * adapter uses (expires_at as integer seconds since the epoch, so one migration serves both
 * engines; lucia's own PostgreSQL adapter wants a timestamptz column instead).
 * Behaves like @lucia-auth/adapter-sqlite: same columns, same expiry rule (expires_at <= now
 * is expired and deleted by deleteExpiredSessions).
 */
import type { Knex } from "knex";
import type { Adapter, DatabaseSession, DatabaseUser } from "lucia";

type Tables = { user: string; session: string };
type SessionRow = { id: string; user_id: string; expires_at: number };
/** User columns handed to lucia as attributes (never the password hash). */
const USER_ATTRIBUTE_COLUMNS = ["email", "name", "is_admin"] as const;

const toSession = (row: SessionRow): DatabaseSession => ({
  id: row.id,
  userId: row.user_id,
  expiresAt: new Date(Number(row.expires_at) * 1000),
  attributes: {},
});

const unixSeconds = (date: Date) => Math.floor(date.getTime() / 1000);

export class KnexSessionAdapter implements Adapter {
  constructor(
    private readonly db: () => Knex,
    private readonly tables: Tables,
  ) {}

  async getSessionAndUser(sessionId: string): Promise<[DatabaseSession | null, DatabaseUser | null]> {
    const { user, session } = this.tables;
    const row = await this.db()(session)
      .join(user, `${user}.id`, `${session}.user_id`)
      .where(`${session}.id`, sessionId)
      .first(`${session}.id`, `${session}.user_id`, `${session}.expires_at`, ...USER_ATTRIBUTE_COLUMNS.map((c) => `${user}.${c}`));
    if (!row) return [null, null];
    const attributes = Object.fromEntries(USER_ATTRIBUTE_COLUMNS.map((c) => [c, row[c]]));
    return [toSession(row), { id: row.user_id, attributes: attributes as DatabaseUser["attributes"] }];
  }

  async getUserSessions(userId: string): Promise<DatabaseSession[]> {
    const rows: SessionRow[] = await this.db()(this.tables.session).where({ user_id: userId }).select("id", "user_id", "expires_at");
    return rows.map(toSession);
  }

  async setSession(s: DatabaseSession): Promise<void> {
    await this.db()(this.tables.session).insert({ id: s.id, user_id: s.userId, expires_at: unixSeconds(s.expiresAt) });
  }

  async updateSessionExpiration(sessionId: string, expiresAt: Date): Promise<void> {
    await this.db()(this.tables.session).where({ id: sessionId }).update({ expires_at: unixSeconds(expiresAt) });
  }

  async deleteSession(sessionId: string): Promise<void> {
    await this.db()(this.tables.session).where({ id: sessionId }).delete();
  }

  async deleteUserSessions(userId: string): Promise<void> {
    await this.db()(this.tables.session).where({ user_id: userId }).delete();
  }

  async deleteExpiredSessions(): Promise<void> {
    await this.db()(this.tables.session).where("expires_at", "<=", unixSeconds(new Date())).delete();
  }
}
