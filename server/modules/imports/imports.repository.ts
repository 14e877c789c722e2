/**
 * SQL for imports. Bulk statements pass whole columns as PostgreSQL arrays (`unnest`), so 100,000 rows
 * take a handful of round trips; they run on a pg client so one import is one transaction.
 */
import type pg from 'pg';
import { getTableColumns } from 'drizzle-orm';
import { homes } from '../../db/schema/tables.js';

export type Queryable = pg.Pool | pg.PoolClient;

/** Runs `fn` in one transaction on one connection: all of it is written, or none. */
export async function inTransaction<T>(pool: pg.Pool, fn: (client: pg.PoolClient) => Promise<T>): Promise<T> {
  const client = await pool.connect();
  try {
    await client.query('begin');
    const result = await fn(client);
    await client.query('commit');
    return result;
  } catch (err) {
    await client.query('rollback').catch(() => undefined);
    throw err;
  } finally {
    client.release();
  }
}

export interface KnownBuilder {
  id: string;
  name: string;
}
export interface KnownCommunity {
  id: string;
  name: string;
  yearFrom: number | null;
  yearTo: number | null;
  hasBoundary: boolean;
  builderIds: string[];
}

export async function listBuilders(db: Queryable, companyId: string): Promise<KnownBuilder[]> {
  const { rows } = await db.query<KnownBuilder>('select id, name from builders where company_id = $1', [companyId]);
  return rows;
}

export async function listCommunities(db: Queryable, companyId: string): Promise<KnownCommunity[]> {
  const { rows } = await db.query<KnownCommunity>(
    `select c.id, c.name, c.year_from as "yearFrom", c.year_to as "yearTo", c.boundary is not null as "hasBoundary",
            coalesce((select array_agg(cb.builder_id::text order by cb.builder_id) from community_builders cb where cb.community_id = c.id), '{}') as "builderIds"
       from communities c where c.company_id = $1`,
    [companyId],
  );
  return rows;
}

/** For each point (by index), the company's community whose boundary contains it (GiST-indexed ST_Contains). */
export async function communitiesAt(db: Queryable, companyId: string, points: { lon: number; lat: number }[]): Promise<(string | null)[]> {
  const out: (string | null)[] = points.map(() => null);
  if (points.length === 0) return out;
  // Boundaries do not overlap by rule; if two ever do, the older community wins.
  const { rows } = await db.query<{ i: number; id: string }>(
    `select p.i::int as i, c.id
       from unnest($2::float8[], $3::float8[]) with ordinality as p(lon, lat, i)
       cross join lateral (
         select c.id from communities c
          where c.company_id = $1 and ST_Contains(c.boundary, ST_SetSRID(ST_MakePoint(p.lon, p.lat), 4326))
          order by c.created_at limit 1
       ) c`,
    [companyId, points.map((p) => p.lon), points.map((p) => p.lat)],
  );
  for (const r of rows) out[r.i - 1] = r.id;
  return out;
}

/** A home as stored: the imported values and its id. */
export interface StoredHome extends HomeValues {
  id: string;
}

/**
 * The company's homes at these address keys; `lock` holds them until the transaction ends (no key update:
 * a sampling plan may still reference them meanwhile).
 */
export async function homesByKey(db: Queryable, companyId: string, keys: string[], lock = false): Promise<Map<string, StoredHome>> {
  if (keys.length === 0) return new Map();
  const { rows } = await db.query<StoredHome>(
    `select h.id, h.address_key as "addressKey", h.number, h.street, h.unit, h.city, h.state, h.zip,
            ST_X(h.location) as lon, ST_Y(h.location) as lat, h.community_id as "communityId", h.builder_id as "builderId",
            h.year_built as "yearBuilt", h.foundation, h.owner_name as "ownerName", h.mailing_address as "mailingAddress",
            h.do_not_contact as "doNotContact"
       from homes h join unnest($2::text[]) as k(key) on h.address_key = k.key
      where h.company_id = $1
      order by h.id -- rows locked in one order by every writer
       ${lock ? 'for no key update of h' : ''}`,
    [companyId, keys],
  );
  return new Map(rows.map((r) => [r.addressKey, r]));
}

/** Creates the named builders (names that already exist are left alone) and returns id by lower-case name. */
export async function createBuilders(db: Queryable, companyId: string, names: string[]): Promise<KnownBuilder[]> {
  if (names.length === 0) return [];
  const { rows } = await db.query<KnownBuilder>(
    `insert into builders (company_id, name) select $1, n from unnest($2::text[]) as n
     on conflict (company_id, lower(name)) do nothing returning id, name`,
    [companyId, names],
  );
  return rows;
}

export async function createCommunities(db: Queryable, companyId: string, names: string[]): Promise<KnownBuilder[]> {
  if (names.length === 0) return [];
  const { rows } = await db.query<KnownBuilder>(
    `insert into communities (company_id, name) select $1, n from unnest($2::text[]) as n
     on conflict (company_id, lower(name)) do nothing returning id, name`,
    [companyId, names],
  );
  return rows;
}

export interface HomeValues {
  addressKey: string;
  number: string;
  street: string;
  unit: string | null;
  city: string;
  state: string;
  zip: string;
  lon: number;
  lat: number;
  communityId: string | null;
  builderId: string | null;
  yearBuilt: number | null;
  foundation: string | null;
  ownerName: string;
  mailingAddress: string;
  doNotContact: boolean;
}

const columnsOf = (rows: HomeValues[]) => [
  rows.map((r) => r.addressKey),
  rows.map((r) => r.number),
  rows.map((r) => r.street),
  rows.map((r) => r.unit),
  rows.map((r) => r.city),
  rows.map((r) => r.state),
  rows.map((r) => r.zip),
  rows.map((r) => r.lon),
  rows.map((r) => r.lat),
  rows.map((r) => r.communityId),
  rows.map((r) => r.builderId),
  rows.map((r) => r.yearBuilt),
  rows.map((r) => r.foundation),
  rows.map((r) => r.ownerName),
  rows.map((r) => r.mailingAddress),
  rows.map((r) => r.doNotContact),
];

const UNNEST_HOMES = `unnest($2::text[], $3::text[], $4::text[], $5::text[], $6::text[], $7::text[], $8::text[], $9::float8[], $10::float8[],
  $11::uuid[], $12::uuid[], $13::int[], $14::text[], $15::text[], $16::text[], $17::bool[])
  as u(address_key, number, street, unit, city, state, zip, lon, lat, community_id, builder_id, year_built, foundation, owner_name, mailing_address, do_not_contact)`;

/**
 * Inserts new homes (outcome stays at its default, 'not_visited') and records them as this batch's
 * insertions, in one statement. A plain INSERT, not ON CONFLICT: the rows were checked against the locked
 * existing homes just before, and speculative insertion measured about twice as slow per row. An address
 * another transaction added meanwhile fails the unique index (homes_company_address_unique), which ends
 * the whole transaction: see isAddressTaken.
 */
export async function insertHomes(db: Queryable, companyId: string, batchId: string, rows: HomeValues[]): Promise<number> {
  if (rows.length === 0) return 0;
  const { rows: out } = await db.query<{ n: number }>(
    `with inserted as (
       insert into homes (company_id, address_key, number, street, unit, city, state, zip, location, community_id, builder_id,
                          year_built, foundation, owner_name, mailing_address, do_not_contact)
       select $1, u.address_key, u.number, u.street, u.unit, u.city, u.state, u.zip, ST_SetSRID(ST_MakePoint(u.lon, u.lat), 4326),
              u.community_id, u.builder_id, u.year_built, u.foundation, u.owner_name, u.mailing_address, u.do_not_contact
         from ${UNNEST_HOMES}
       returning id
     ), recorded as (
       insert into import_changes (batch_id, home_id, action) select $18, id, 'inserted' from inserted returning 1
     )
     select count(*)::int as n from recorded`,
    [companyId, ...columnsOf(rows), batchId],
  );
  return out[0].n;
}

/**
 * What the map draws (tile versions, overview cells, stored tiles) is refreshed by triggers after each
 * statement; an import's statements of 5,000 rows would count the same cells and encode the same tiles
 * again and again, and hold the company's map locks from its first statement. This transaction takes
 * that on: call refreshHomeCellsOfBatch once its homes are written.
 */
export async function deferHomeCells(db: Queryable) {
  await db.query(`select set_config('tractwise.home_cells_deferred', 'on', true)`);
}

/**
 * The map where the batch's homes now are, and where its updated homes were, made current: cached tiles
 * given new versions, overview cells counted again and stored tiles encoded again (then no longer deferred).
 */
export async function refreshHomeCellsOfBatch(db: Queryable, companyId: string, batchId: string) {
  await db.query(
    `select refresh_home_map_at(array_agg(company_id), array_agg(x), array_agg(y)) from (
       select h.company_id, h.merc_x as x, h.merc_y as y from import_changes c join homes h on h.id = c.home_id where c.batch_id = $2
       union all
       select $1::uuid, (c.previous->>'merc_x')::float8, (c.previous->>'merc_y')::float8 from import_changes c where c.batch_id = $2 and c.action = 'updated'
     ) p`,
    [companyId, batchId],
  );
  await db.query(`select set_config('tractwise.home_cells_deferred', 'off', true)`);
}

/** True for the error of an INSERT that met a home already at that address. */
export function isAddressTaken(err: unknown): boolean {
  const e = err as { code?: string; constraint?: string } | null;
  return e?.code === '23505' && e.constraint === 'homes_company_address_unique';
}

export async function updateHomes(db: Queryable, companyId: string, rows: HomeValues[]): Promise<number> {
  if (rows.length === 0) return 0;
  const result = await db.query(
    `update homes h set number = u.number, street = u.street, unit = u.unit, city = u.city, state = u.state, zip = u.zip,
            location = ST_SetSRID(ST_MakePoint(u.lon, u.lat), 4326), community_id = u.community_id, builder_id = u.builder_id,
            year_built = u.year_built, foundation = u.foundation, owner_name = u.owner_name, mailing_address = u.mailing_address,
            do_not_contact = u.do_not_contact, updated_at = now()
       from ${UNNEST_HOMES}
      where h.company_id = $1 and h.address_key = u.address_key`,
    [companyId, ...columnsOf(rows)],
  );
  return result.rowCount ?? 0;
}

/** Keeps each home's whole row as it is now (to_jsonb), so undo can put it back exactly. */
export async function recordPreviousRows(db: Queryable, batchId: string, companyId: string, homeIds: string[]) {
  if (homeIds.length === 0) return;
  await db.query(
    `insert into import_changes (batch_id, home_id, action, previous)
     select $1, h.id, 'updated', to_jsonb(h) from homes h where h.company_id = $2 and h.id = any($3::uuid[])`,
    [batchId, companyId, homeIds],
  );
}

export interface BatchInsert {
  id: string;
  companyId: string;
  userId: string;
  fileName: string;
  mapping: unknown;
  rowCount: number;
  inserted: number;
  updated: number;
  unchanged: number;
  rejected: number;
  errors: unknown;
}

export async function insertBatch(db: Queryable, b: BatchInsert) {
  await db.query(
    `insert into import_batches (id, company_id, user_id, file_name, status, mapping, row_count, inserted_count, updated_count,
                                 unchanged_count, rejected_count, errors)
     values ($1, $2, $3, $4, 'committed', $5, $6, $7, $8, $9, $10, $11)`,
    [b.id, b.companyId, b.userId, b.fileName, JSON.stringify(b.mapping), b.rowCount, b.inserted, b.updated, b.unchanged, b.rejected, JSON.stringify(b.errors)],
  );
}

export async function rememberMapping(db: Queryable, companyId: string, headerKey: string, mapping: unknown) {
  await db.query(
    `insert into column_mappings (company_id, header_key, mapping, updated_at) values ($1, $2, $3, now())
     on conflict (company_id, header_key) do update set mapping = excluded.mapping, updated_at = now()`,
    [companyId, headerKey, JSON.stringify(mapping)],
  );
}

export async function rememberedMapping(db: Queryable, companyId: string, headerKey: string): Promise<unknown | null> {
  const { rows } = await db.query<{ mapping: unknown }>('select mapping from column_mappings where company_id = $1 and header_key = $2', [companyId, headerKey]);
  return rows[0]?.mapping ?? null;
}

/** Every mapping the company has saved, by header key (a few rows: one per file layout it has imported). */
export async function rememberedMappings(db: Queryable, companyId: string): Promise<Map<string, unknown>> {
  const { rows } = await db.query<{ headerKey: string; mapping: unknown }>('select header_key as "headerKey", mapping from column_mappings where company_id = $1', [companyId]);
  return new Map(rows.map((r) => [r.headerKey, r.mapping]));
}

export interface BatchRow {
  id: string;
  fileName: string;
  status: 'committed' | 'undone';
  mapping: Record<string, unknown>;
  rowCount: number;
  insertedCount: number;
  updatedCount: number;
  unchangedCount: number;
  rejectedCount: number;
  errors: { row: number; field: string; reason: string }[];
  createdAt: Date;
  undoneAt: Date | null;
  userName: string | null;
  /** Set by listBatches, whose `errors` holds only the first few. */
  errorCount?: number;
}

const BATCH_COLUMNS = `b.id, b.file_name as "fileName", b.status, b.mapping, b.row_count as "rowCount", b.inserted_count as "insertedCount",
  b.updated_count as "updatedCount", b.unchanged_count as "unchangedCount", b.rejected_count as "rejectedCount", b.errors,
  b.created_at as "createdAt", b.undone_at as "undoneAt", u.name as "userName"`;

export async function findBatch(db: Queryable, companyId: string, id: string, lock = false): Promise<BatchRow | undefined> {
  const { rows } = await db.query<BatchRow>(
    `select ${BATCH_COLUMNS} from import_batches b left join users u on u.id = b.user_id
      where b.company_id = $1 and b.id = $2 ${lock ? 'for update of b' : ''}`,
    [companyId, id],
  );
  return rows[0];
}

/** Any company's batch with this id (an import id is client-generated: it must not be reused across companies). */
export async function batchExists(db: Queryable, id: string): Promise<{ companyId: string } | undefined> {
  const { rows } = await db.query<{ companyId: string }>('select company_id as "companyId" from import_batches where id = $1', [id]);
  return rows[0];
}

/** History, newest first; the errors and rejected rows stay out of the list (they can be large). */
export async function listBatches(db: Queryable, companyId: string, limit: number): Promise<BatchRow[]> {
  const { rows } = await db.query<BatchRow>(
    `select b.id, b.file_name as "fileName", b.status, jsonb_build_object('created', b.mapping->'created') as mapping, b.row_count as "rowCount",
            b.inserted_count as "insertedCount", b.updated_count as "updatedCount", b.unchanged_count as "unchangedCount",
            b.rejected_count as "rejectedCount", (select coalesce(jsonb_agg(e), '[]') from (select e from jsonb_array_elements(b.errors) e limit 20) x) as errors,
            jsonb_array_length(b.errors) as "errorCount",
            b.created_at as "createdAt", b.undone_at as "undoneAt", u.name as "userName"
       from import_batches b left join users u on u.id = b.user_id
      where b.company_id = $1 order by b.created_at desc limit $2`,
    [companyId, limit],
  );
  return rows;
}

/**
 * Why an import can no longer be undone exactly: homes visited, tested or edited since, or a later import
 * on them. "Since" is the batch's own transaction timestamp, compared in SQL (JavaScript dates drop microseconds).
 */
export async function undoBlockers(db: Queryable, companyId: string, batchId: string) {
  const { rows } = await db.query<{ kind: 'visits' | 'tests' | 'edits' | 'later imports'; n: number; example: string | null }>(
    `with batch as (select created_at from import_batches where id = $2 and company_id = $1),
     touched as (select c.home_id from import_changes c where c.batch_id = $2 and c.action in ('inserted', 'updated'))
     select 'visits' as kind, count(distinct v.home_id)::int as n, min(h.number || ' ' || h.street) as example
       from visits v join touched t on t.home_id = v.home_id join homes h on h.id = v.home_id
      where v.company_id = $1 and v.created_at >= (select created_at from batch)
     union all
     select 'tests', count(distinct r.home_id)::int, min(h.number || ' ' || h.street)
       from radon_tests r join touched t on t.home_id = r.home_id join homes h on h.id = r.home_id
      where r.company_id = $1 and r.created_at >= (select created_at from batch)
     union all
     select 'edits', count(*)::int, min(h.number || ' ' || h.street)
       from homes h join touched t on t.home_id = h.id where h.company_id = $1 and h.updated_at > (select created_at from batch)
     union all
     select 'later imports', count(distinct b.id)::int, min(b.file_name)
       from import_batches b join import_changes c on c.batch_id = b.id join touched t on t.home_id = c.home_id
      where b.company_id = $1 and b.id <> $2 and b.status = 'committed' and b.created_at > (select created_at from batch)
        and c.action in ('inserted', 'updated')`,
    [companyId, batchId],
  );
  return rows.filter((r) => r.n > 0);
}

/** Every column of a home except its identity and what the database derives itself: what undo writes back. */
export const RESTORED_HOME_COLUMNS = Object.values(getTableColumns(homes))
  .filter((c) => c.generated === undefined && c.generatedIdentity === undefined)
  .map((c) => c.name)
  .filter((n) => n !== 'id' && n !== 'company_id');

/**
 * Locks every home the batch inserted or updated, before undo checks them and before it takes the map's
 * lock: a visit recorded meanwhile is then either seen by undoBlockers or waits for the undo.
 */
export async function lockBatchHomes(db: Queryable, companyId: string, batchId: string) {
  await db.query(
    `select h.id from homes h join import_changes c on c.home_id = h.id
      where c.batch_id = $2 and h.company_id = $1 and c.action in ('inserted', 'updated') order by h.id for update of h`,
    [companyId, batchId],
  );
}

/** Puts every updated home back as it was (its whole row, from to_jsonb) and deletes the homes the import added. */
export async function revertBatch(db: Queryable, companyId: string, batchId: string) {
  const set = RESTORED_HOME_COLUMNS.map((c) => `${c} = p.${c}`).join(', ');
  const restored = await db.query(
    `update homes h set ${set}
       from import_changes c, jsonb_populate_record(null::homes, c.previous) p
      where c.batch_id = $2 and c.action = 'updated' and h.id = c.home_id and h.company_id = $1`,
    [companyId, batchId],
  );
  const deleted = await db.query(
    `delete from homes h using import_changes c
      where c.batch_id = $2 and c.action = 'inserted' and h.id = c.home_id and h.company_id = $1`,
    [companyId, batchId],
  );
  return { restored: restored.rowCount ?? 0, deleted: deleted.rowCount ?? 0 };
}

/**
 * Locks the builders and communities the import created, after its homes and before the map's lock
 * (revertBatch): a home written meanwhile that refers to one of them holds it (key share) and then asks
 * for the map's lock, so undo must not wait on it while holding that lock (DEVELOPERS.md, "Locks").
 */
export async function lockCreated(db: Queryable, companyId: string, builderIds: string[], communityIds: string[]) {
  if (communityIds.length) {
    await db.query(`select id from communities where company_id = $1 and id = any($2::uuid[]) order by id for update`, [companyId, communityIds]);
  }
  if (builderIds.length) {
    await db.query(`select id from builders where company_id = $1 and id = any($2::uuid[]) order by id for update`, [companyId, builderIds]);
  }
}

/** Removes builders and communities the import created, where nothing refers to them any more. */
export async function deleteCreatedIfUnused(db: Queryable, companyId: string, builderIds: string[], communityIds: string[]) {
  if (communityIds.length) {
    await db.query(
      `delete from communities c where c.company_id = $1 and c.id = any($2::uuid[])
         and not exists (select 1 from homes h where h.community_id = c.id)
         and not exists (select 1 from sampling_plans s where s.community_id = c.id)
         and not exists (select 1 from quotes q where q.community_id = c.id)`,
      [companyId, communityIds],
    );
  }
  if (builderIds.length) {
    await db.query(
      `delete from builders b where b.company_id = $1 and b.id = any($2::uuid[])
         and not exists (select 1 from homes h where h.builder_id = b.id)
         and not exists (select 1 from community_builders cb where cb.builder_id = b.id)`,
      [companyId, builderIds],
    );
  }
}

export async function markUndone(db: Queryable, batchId: string) {
  await db.query(`update import_batches set status = 'undone', undone_at = now() where id = $1`, [batchId]);
}
