import pg from 'pg';
import type { Sequelize } from 'sequelize';

/** The channel the triggers of migration 0011 notify with a user's id when what a session rests on changes. */
export const SESSION_CHANNEL = 'sowright_sessions';

/**
 * The people behind live sessions, kept in memory so an authenticated request needs no round trip to load
 * its person. A request still checks the token version, status, role and grower scope on every request:
 * only where they come from changes. An entry is dropped
 * - at once, by the code in this process that changed the person (`forgetSession` after the commit);
 * - when PostgreSQL notifies `sowright_sessions` (triggers on `users` and `consultant_growers`, so a change
 *   made by another process or by hand in psql also ends sessions), through one listening connection;
 * - after `ttlMs` whatever happens, in case a notification was lost with its connection.
 * Nothing is kept while the listening connection is down: every request then reads the database, as before.
 */
export class SessionCache<Row> {
  private readonly entries = new Map<string, { row: Row | null; at: number }>();
  /** Moves on at every forget: a load that began before one is not kept, it may hold the old row. */
  private epoch = 0;
  private listener: pg.Client | null = null;
  private listening = false;
  private stopped = false;
  private retry: NodeJS.Timeout | null = null;

  constructor(
    private readonly sequelize: Sequelize,
    private readonly load: (id: string) => Promise<Row | null>,
    private readonly opts: { ttlMs?: number; maxEntries?: number } = {},
  ) {
    live.add(this);
  }

  /** Opens the listening connection; until it listens, nothing is cached. */
  async start() {
    if (this.stopped || this.listener) return;
    const c = this.sequelize.config;
    const client = new pg.Client({
      host: c.host,
      port: Number(c.port),
      user: c.username,
      password: c.password ?? undefined,
      database: c.database,
    });
    this.listener = client;
    const down = () => {
      if (this.listener !== client) return;
      this.listener = null;
      this.listening = false;
      this.clear();
      client.removeAllListeners();
      client.on('error', () => {});
      client.end().catch(() => {});
      if (!this.stopped) this.retry = setTimeout(() => void this.start(), 1000).unref();
    };
    client.on('error', down);
    client.on('end', down);
    client.on('notification', (n) => {
      if (n.channel === SESSION_CHANNEL && n.payload) this.forget(n.payload);
    });
    try {
      await client.connect();
      // The connection must not keep a test process or a stopping server alive on its own.
      (client as unknown as { connection: { stream: { unref(): void } } }).connection.stream.unref();
      await client.query(`LISTEN ${SESSION_CHANNEL}`);
      if (this.listener === client) {
        this.clear();
        this.listening = true;
      }
    } catch {
      down();
    }
  }

  async stop() {
    this.stopped = true;
    live.delete(this);
    if (this.retry) clearTimeout(this.retry);
    const client = this.listener;
    this.listener = null;
    this.listening = false;
    this.clear();
    if (client) {
      client.removeAllListeners();
      client.on('error', () => {});
      await client.end().catch(() => {});
    }
  }

  get active() {
    return this.listening;
  }

  async get(id: string): Promise<Row | null> {
    const now = Date.now();
    const hit = this.entries.get(id);
    if (hit && now - hit.at < (this.opts.ttlMs ?? 5000)) return hit.row;
    const epoch = this.epoch;
    const row = await this.load(id);
    if (this.listening && epoch === this.epoch) {
      if (this.entries.size >= (this.opts.maxEntries ?? 10_000)) this.entries.clear();
      this.entries.set(id, { row, at: now });
    }
    return row;
  }

  forget(id: string) {
    this.epoch++;
    this.entries.delete(id);
  }

  clear() {
    this.epoch++;
    this.entries.clear();
  }
}

const live = new Set<SessionCache<unknown>>();

/** Call after committing a change to a person's status, role, token version or growers. */
export function forgetSession(userId: string) {
  for (const cache of live) cache.forget(userId);
}
