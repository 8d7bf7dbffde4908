import type { Kysely } from 'kysely';
import type { StoreHandle } from './open-store.ts';
import { writeTransaction } from './open-store.ts';
import type { StoreSchema } from './schema.ts';
import type { SecretBox } from './secret-box.ts';

/** A person of the workspace as stored; `data` keeps the rest of their entry. */
export interface StoredPerson {
  readonly id: string;
  readonly name: string;
  readonly email: string | null;
  readonly zone: string;
  readonly data: Readonly<Record<string, unknown>>;
}

/** A room of the workspace as stored. */
export interface StoredRoom {
  readonly id: string;
  readonly name: string;
  readonly capacity: number | null;
  readonly zone: string | null;
  readonly data: Readonly<Record<string, unknown>>;
}

/** A group of the workspace. */
export interface StoredGroup {
  readonly id: string;
  readonly members: readonly string[];
}

/** Fetch state of a feed, for conditional requests and for falling back to the last good copy. */
export interface FeedFetchState {
  readonly etag: string | null;
  readonly lastModified: string | null;
  readonly lastBody: string | null;
  readonly lastBusy: unknown;
  readonly lastOkAt: number | null;
  readonly lastErrAt: number | null;
  readonly lastError: string | null;
}

/** A feed as stored, with its URL decrypted. */
export interface StoredFeed extends FeedFetchState {
  readonly id: string;
  readonly owner: string;
  readonly url: string;
}

/** One cached stretch of busy time. */
export interface CachedBusy {
  readonly start: number;
  readonly end: number;
  readonly kind: string;
}

/** A result that can be refused because the actor does not own the thing. */
export type OwnedOutcome =
  | { readonly ok: true }
  | { readonly ok: false; readonly reason: 'not_found' | 'not_owner' };

const json = (v: unknown) => JSON.stringify(v);
const parse = (s: string | null): unknown => (s === null ? null : JSON.parse(s));

/**
 * Workspace state in SQL: people, rooms, groups, feeds (URLs encrypted), cached busy time,
 * requests with their options, series and week plans. Rules are in SqlRuleStore.
 */
export class SqlWorkspaceStore {
  readonly #handle: StoreHandle;
  readonly #box: SecretBox;

  /** Wraps an open store; `box` encrypts feed URLs. */
  constructor(handle: StoreHandle, box: SecretBox) {
    this.#handle = handle;
    this.#box = box;
  }

  get #db(): Kysely<StoreSchema> {
    return this.#handle.db;
  }

  /** Replaces people, rooms and groups with the workspace file's current lists, in one transaction. */
  async replaceDirectory(dir: {
    readonly people: readonly StoredPerson[];
    readonly rooms: readonly StoredRoom[];
    readonly groups: readonly StoredGroup[];
  }): Promise<void> {
    await writeTransaction(this.#handle, async (tx) => {
      await tx.deleteFrom('person').execute();
      await tx.deleteFrom('room').execute();
      await tx.deleteFrom('group_').execute();
      if (dir.people.length > 0)
        await tx
          .insertInto('person')
          .values(
            dir.people.map((p) => ({
              id: p.id,
              name: p.name,
              email: p.email,
              zone: p.zone,
              data: json(p.data),
            })),
          )
          .execute();
      if (dir.rooms.length > 0)
        await tx
          .insertInto('room')
          .values(
            dir.rooms.map((r) => ({
              id: r.id,
              name: r.name,
              capacity: r.capacity,
              zone: r.zone,
              data: json(r.data),
            })),
          )
          .execute();
      if (dir.groups.length > 0)
        await tx
          .insertInto('group_')
          .values(dir.groups.map((g) => ({ id: g.id, members: json(g.members) })))
          .execute();
    });
  }

  /** People, by id. */
  async people(): Promise<StoredPerson[]> {
    const rows = await this.#db.selectFrom('person').selectAll().orderBy('id').execute();
    return rows.map((r) => ({ ...r, data: parse(r.data) as Record<string, unknown> }));
  }

  /** Rooms, by id. */
  async rooms(): Promise<StoredRoom[]> {
    const rows = await this.#db.selectFrom('room').selectAll().orderBy('id').execute();
    return rows.map((r) => ({
      ...r,
      capacity: r.capacity === null ? null : Number(r.capacity),
      data: parse(r.data) as Record<string, unknown>,
    }));
  }

  /** Groups, by id. */
  async groups(): Promise<StoredGroup[]> {
    const rows = await this.#db.selectFrom('group_').selectAll().orderBy('id').execute();
    return rows.map((r) => ({ id: r.id, members: parse(r.members) as string[] }));
  }

  /** Adds a feed; its URL is encrypted before it is written. */
  async addFeed(feed: { readonly id: string; readonly owner: string; readonly url: string }): Promise<void> {
    await this.#db
      .insertInto('feed')
      .values({
        id: feed.id,
        owner: feed.owner,
        url_encrypted: this.#box.seal(feed.url),
        etag: null,
        last_modified: null,
        last_body: null,
        last_busy: null,
        last_ok_ms: null,
        last_err_ms: null,
        last_error: null,
      })
      .execute();
  }

  /** Feeds, optionally of one owner, URLs decrypted. */
  async feeds(owner?: string): Promise<StoredFeed[]> {
    let q = this.#db.selectFrom('feed').selectAll().orderBy('id');
    if (owner !== undefined) q = q.where('owner', '=', owner);
    const rows = await q.execute();
    return rows.map((r) => ({
      id: r.id,
      owner: r.owner,
      url: this.#box.open(r.url_encrypted),
      etag: r.etag,
      lastModified: r.last_modified,
      lastBody: r.last_body,
      lastBusy: parse(r.last_busy),
      lastOkAt: r.last_ok_ms === null ? null : Number(r.last_ok_ms),
      lastErrAt: r.last_err_ms === null ? null : Number(r.last_err_ms),
      lastError: r.last_error,
    }));
  }

  /** Records how a fetch went; a failed fetch keeps the last good body and busy time. */
  async recordFetch(
    id: string,
    result:
      | {
          readonly ok: true;
          readonly at: number;
          readonly etag: string | null;
          readonly lastModified: string | null;
          readonly body: string | null;
          readonly busy: unknown;
        }
      | { readonly ok: false; readonly at: number; readonly error: string },
  ): Promise<void> {
    const set = result.ok
      ? {
          etag: result.etag,
          last_modified: result.lastModified,
          last_body: result.body,
          last_busy: json(result.busy),
          last_ok_ms: result.at,
          last_error: null,
        }
      : { last_err_ms: result.at, last_error: result.error };
    await this.#db.updateTable('feed').set(set).where('id', '=', id).execute();
  }

  /** Removes a feed when `actor` owns it, with its cached busy time. */
  async removeFeed(id: string, actor: string): Promise<OwnedOutcome> {
    return writeTransaction(this.#handle, async (tx) => {
      const row = await tx.selectFrom('feed').select('owner').where('id', '=', id).executeTakeFirst();
      if (row === undefined) return { ok: false, reason: 'not_found' } as const;
      if (row.owner !== actor) return { ok: false, reason: 'not_owner' } as const;
      await tx.deleteFrom('busy_cache').where('feed_id', '=', id).execute();
      await tx.deleteFrom('feed').where('id', '=', id).execute();
      return { ok: true } as const;
    });
  }

  /** Replaces the cached busy time one feed gave a resource. */
  async replaceBusy(resource: string, feedId: string, busy: readonly CachedBusy[]): Promise<void> {
    await writeTransaction(this.#handle, async (tx) => {
      await tx
        .deleteFrom('busy_cache')
        .where('resource', '=', resource)
        .where('feed_id', '=', feedId)
        .execute();
      if (busy.length > 0)
        await tx
          .insertInto('busy_cache')
          .values(
            busy.map((b) => ({ resource, feed_id: feedId, start_ms: b.start, end_ms: b.end, kind: b.kind })),
          )
          .execute();
    });
  }

  /** Cached busy time of a resource overlapping a window, by start. */
  async busy(
    resource: string,
    window: { readonly start: number; readonly end: number },
  ): Promise<CachedBusy[]> {
    const rows = await this.#db
      .selectFrom('busy_cache')
      .select(['start_ms', 'end_ms', 'kind'])
      .where('resource', '=', resource)
      .where('start_ms', '<', window.end)
      .where('end_ms', '>', window.start)
      .orderBy('start_ms')
      .execute();
    return rows.map((r) => ({ start: Number(r.start_ms), end: Number(r.end_ms), kind: r.kind }));
  }

  /** Saves a request with the options offered for it (replaces an earlier save of the same id). */
  async saveRequest(req: {
    readonly id: string;
    readonly organizer: string;
    readonly body: unknown;
    readonly options: readonly unknown[];
    readonly at: number;
  }): Promise<void> {
    await this.#db
      .insertInto('request')
      .values({
        id: req.id,
        organizer: req.organizer,
        body: json(req.body),
        options: json(req.options),
        created_ms: req.at,
      })
      .onConflict((oc) => oc.column('id').doUpdateSet({ body: json(req.body), options: json(req.options) }))
      .execute();
  }

  /** A request by id. */
  async request(
    id: string,
  ): Promise<
    { id: string; organizer: string; body: unknown; options: unknown[]; createdAt: number } | undefined
  > {
    const r = await this.#db.selectFrom('request').selectAll().where('id', '=', id).executeTakeFirst();
    return r === undefined
      ? undefined
      : {
          id: r.id,
          organizer: r.organizer,
          body: parse(r.body),
          options: parse(r.options) as unknown[],
          createdAt: Number(r.created_ms),
        };
  }

  /** Saves a series definition (replaces by id). */
  async saveSeries(s: {
    readonly id: string;
    readonly owner: string;
    readonly body: unknown;
    readonly at: number;
  }) {
    await this.#db
      .insertInto('series')
      .values({ id: s.id, owner: s.owner, body: json(s.body), created_ms: s.at })
      .onConflict((oc) => oc.column('id').doUpdateSet({ owner: s.owner, body: json(s.body) }))
      .execute();
  }

  /** All series, by id. */
  async series(): Promise<{ id: string; owner: string; body: unknown }[]> {
    const rows = await this.#db.selectFrom('series').selectAll().orderBy('id').execute();
    return rows.map((r) => ({ id: r.id, owner: r.owner, body: parse(r.body) }));
  }

  /** Saves a week plan (replaces by id). */
  async saveWeekPlan(p: {
    readonly id: string;
    readonly isoWeek: string;
    readonly body: unknown;
    readonly at: number;
  }) {
    await this.#db
      .insertInto('week_plan')
      .values({ id: p.id, iso_week: p.isoWeek, body: json(p.body), created_ms: p.at })
      .onConflict((oc) => oc.column('id').doUpdateSet({ iso_week: p.isoWeek, body: json(p.body) }))
      .execute();
  }

  /** Week plans of one ISO week, newest first. */
  async weekPlans(
    isoWeek: string,
  ): Promise<{ id: string; isoWeek: string; body: unknown; createdAt: number }[]> {
    const rows = await this.#db
      .selectFrom('week_plan')
      .selectAll()
      .where('iso_week', '=', isoWeek)
      .orderBy('created_ms', 'desc')
      .execute();
    return rows.map((r) => ({
      id: r.id,
      isoWeek: r.iso_week,
      body: parse(r.body),
      createdAt: Number(r.created_ms),
    }));
  }
}
