/**
 * Address import: a CSV becomes homes in five stages — receive (stream-parse and check every row),
 * geocode (rows without coordinates, through the geocoder), assign (communities by boundary, builder and
 * year from the community), write (one transaction: all valid rows or none) and, later, undo.
 */
import type pg from 'pg';
import { normaliseStreet, parseStreetLine } from '../../../shared/domain/address.js';
import { guessMapping, headerKey, toSafeCsv } from '../../../shared/domain/csv.js';
import { geocodeLine, readImportRow, resolveColumns, type ImportCandidate, type ResolvedColumns } from '../../../shared/domain/imports.js';
import type { SessionUser } from '../../../shared/schemas/auth.js';
import {
  ColumnMapping,
  ERRORS_SHOWN,
  IMPORT_FIELD_LABELS,
  type ImportDto,
  type MappingSuggestionDto,
  type RowError,
  type StartImportQuery,
} from '../../../shared/schemas/imports.js';
import { AppError } from '../../lib/errors.js';
import { logger } from '../../lib/logger.js';
import { GeocoderUnavailableError, type Geocoder } from '../geocoding/geocoder.js';
import { CsvLimitError, formatBytes, readCsvStream } from './csv-stream.js';
import { ImportJobs, type ImportJob } from './import-jobs.js';
import * as repo from './imports.repository.js';

export interface ImportDeps {
  pool: pg.Pool;
  geocoder: Geocoder;
  jobs: ImportJobs;
  limits: { maxBytes: number; maxRows: number };
}

/** Rows per INSERT/UPDATE statement: progress moves in steps of this many. */
const WRITE_CHUNK = 5_000;
/** Rejected rows kept with the batch for the error CSV. */
const REJECTED_ROWS_KEPT = 20_000;

interface Entry {
  row: number;
  cells: string[];
  candidate: ImportCandidate | null;
  errors: RowError[];
  /** Set by the later stages. */
  existing?: repo.StoredHome;
  communityId?: string | null;
  builderId?: string | null;
  yearBuilt?: number | null;
}

/** What the batch row keeps about how the file was read (jsonb `mapping`). */
interface StoredMapping {
  fields: ColumnMapping;
  headers: string[];
  delimiter: string;
  created: { builders: { id: string; name: string }[]; communities: { id: string; name: string }[] };
  rejectedRows: { row: number; cells: string[] }[];
}

const nameKey = (s: string) => s.trim().replace(/\s+/g, ' ').toLowerCase();

// ---------------------------------------------------------------------------------------------------
// Mapping
// ---------------------------------------------------------------------------------------------------

export async function suggestMapping(deps: ImportDeps, viewer: SessionUser, headers: string[]): Promise<MappingSuggestionDto> {
  const remembered = ColumnMapping.safeParse(await repo.rememberedMapping(deps.pool, viewer.companyId, headerKey(headers)));
  if (remembered.success && Object.keys(remembered.data).length > 0) return { mapping: remembered.data, source: 'remembered' };
  return { mapping: guessMapping(headers), source: 'guessed' };
}

// ---------------------------------------------------------------------------------------------------
// Start: receive the file
// ---------------------------------------------------------------------------------------------------

export async function startImport(
  deps: ImportDeps,
  viewer: SessionUser,
  query: StartImportQuery,
  body: AsyncIterable<Buffer>,
  contentLength: number | null,
): Promise<{ job: ImportDto; repeated: boolean }> {
  // The same id again (a double click, a retried request): the same job, not a second import.
  const running = deps.jobs.get(query.id);
  if (running && running.status !== 'failed') {
    if (running.companyId !== viewer.companyId) throw AppError.conflict('This import id is already in use; reload the page');
    return { job: jobDto(running), repeated: true };
  }
  if (contentLength !== null && contentLength > deps.limits.maxBytes) {
    throw new AppError('PAYLOAD_TOO_LARGE', 413, `The file is larger than the import limit of ${formatBytes(deps.limits.maxBytes)}: split it into smaller files`);
  }

  // Registered before the first await, so a second request with this id finds it.
  const job: ImportJob = {
    id: query.id,
    companyId: viewer.companyId,
    userId: viewer.id,
    userName: viewer.name,
    fileName: query.fileName,
    status: 'receiving',
    createdAt: new Date(),
    progress: { rowsParsed: 0, rowsToGeocode: 0, rowsGeocoded: 0, rowsToWrite: 0, rowsWritten: 0 },
    counts: null,
    errors: [],
    failure: null,
    created: { builders: [], communities: [] },
    finishedAt: null,
  };
  deps.jobs.add(job);
  const stored = await repo.batchExists(deps.pool, query.id);
  if (stored) {
    deps.jobs.remove(query.id);
    if (stored.companyId !== viewer.companyId) throw AppError.conflict('This import id is already in use; reload the page');
    return { job: await getImport(deps, viewer, query.id), repeated: true };
  }

  let received: Received;
  try {
    received = await receive(deps, viewer, query, body, job);
  } catch (err) {
    const appError = toAppError(err);
    job.failure = { code: appError.code, message: appError.message, ...(appError.fields ? { fields: appError.fields } : {}) };
    deps.jobs.finish(job, 'failed');
    throw appError;
  }
  // The rest runs after the answer; the client polls GET /api/imports/:id.
  void process(deps, viewer, query, job, received).catch((err) => {
    const appError = toAppError(err);
    if (appError.code === 'INTERNAL') logger.error('import failed', { importId: job.id, err: String((err as Error)?.stack ?? err) });
    else logger.warn('import stopped', { importId: job.id, reason: appError.message });
    job.failure = { code: appError.code, message: `${appError.message}. Nothing was imported.` };
    deps.jobs.finish(job, 'failed');
  });
  return { job: jobDto(job), repeated: false };
}

function toAppError(err: unknown): AppError {
  if (err instanceof AppError) return err;
  if (err instanceof CsvLimitError) return new AppError('PAYLOAD_TOO_LARGE', 413, err.message);
  if (err instanceof GeocoderUnavailableError) {
    return new AppError('UNPROCESSABLE', 502, `${err.message}: add latitude and longitude columns, or try again later`);
  }
  return new AppError('INTERNAL', 500, 'The import stopped on an unexpected error');
}

async function receive(deps: ImportDeps, viewer: SessionUser, query: StartImportQuery, body: AsyncIterable<Buffer>, job: ImportJob) {
  // Loaded before the body is read, so the header row can be resolved while records stream past.
  const remembered = query.mapping ? null : await repo.rememberedMappings(deps.pool, viewer.companyId);
  let headers: string[] | null = null;
  let columns: ResolvedColumns = {};
  let mapping: ColumnMapping = {};
  let mappingProblem: AppError | null = null;
  const entries: Entry[] = [];
  const ctx = { currentYear: new Date().getFullYear() };

  const { delimiter } = await readCsvStream(body, {
    maxBytes: deps.limits.maxBytes,
    maxRows: deps.limits.maxRows,
    delimiter: query.delimiter,
    onRecord(cells, row, problems) {
      if (row === 1) {
        headers = cells.map((c) => c.trim());
        mapping = query.mapping ?? rememberedFor(remembered!, headers) ?? guessMapping(headers);
        const resolved = resolveColumns(headers, mapping);
        columns = resolved.columns;
        if (resolved.problems.length) {
          mappingProblem = mappingError(resolved.problems);
          return false; // nothing can be read with this mapping: stop parsing, answer now
        }
        return;
      }
      const result = readImportRow(cells, columns, row, ctx);
      if (result.blank) return;
      const errors = [...problems.map((reason) => ({ row, field: '(row)', reason })), ...result.errors];
      entries.push({ row, cells, candidate: errors.length ? null : result.candidate, errors });
      job.progress.rowsParsed = entries.length;
    },
  });
  if (mappingProblem) throw mappingProblem;
  if (!headers) throw AppError.unprocessable('The file is empty: it needs a header row and at least one address');
  if (entries.length === 0) throw AppError.unprocessable('The file has a header row but no addresses below it');
  return { headers: headers as string[], mapping, columns, delimiter, entries };
}

type Received = Awaited<ReturnType<typeof receive>>;

function rememberedFor(remembered: Map<string, unknown>, headers: string[]): ColumnMapping | null {
  const parsed = ColumnMapping.safeParse(remembered.get(headerKey(headers)));
  return parsed.success && Object.keys(parsed.data).length > 0 ? parsed.data : null;
}

function mappingError(problems: { field: string; message: string }[]): AppError {
  const missing = problems.filter((p) => p.message.endsWith('(required)'));
  const labels = missing.map((p) => IMPORT_FIELD_LABELS[p.field as keyof typeof IMPORT_FIELD_LABELS]);
  const message =
    missing.length === problems.length
      ? `The file has no column for ${listOf(labels)}: add ${missing.length > 1 ? 'these columns' : 'this column'} or map other columns to ${missing.length > 1 ? 'them' : 'it'}`
      : `The file's columns do not fit the mapping: ${problems.map((p) => p.message).join('; ')}`;
  return AppError.unprocessable(message, problems);
}

function listOf(items: string[]): string {
  if (items.length <= 1) return items.join('');
  return `${items.slice(0, -1).join(', ')} and ${items[items.length - 1]}`;
}

// ---------------------------------------------------------------------------------------------------
// Check across rows, geocode, assign, write
// ---------------------------------------------------------------------------------------------------

type Resolved = { kind: 'known'; id: string } | { kind: 'new'; name: string };

async function process(deps: ImportDeps, viewer: SessionUser, query: StartImportQuery, job: ImportJob, received: Received): Promise<void> {
  const { entries, columns } = received;
  const timings: Record<string, number> = { receive: Date.now() - job.createdAt.getTime() };
  let lap = performance.now();
  const mark = (stage: string) => {
    const now = performance.now();
    timings[stage] = Math.round(now - lap);
    lap = now;
  };
  const fieldOf = (f: keyof typeof IMPORT_FIELD_LABELS) => columns[f]?.header ?? IMPORT_FIELD_LABELS[f];
  const reject = (e: Entry, field: string, reason: string) => {
    e.errors.push({ row: e.row, field, reason });
    e.candidate = null;
  };
  const live = () => entries.filter((e) => e.candidate !== null);

  // The same address twice in one file: the first row counts, later ones are reported.
  const firstRow = new Map<string, number>();
  for (const e of live()) {
    const key = e.candidate!.addressKey;
    const first = firstRow.get(key);
    if (first === undefined) firstRow.set(key, e.row);
    else reject(e, fieldOf('address'), `the same address as row ${first}`);
  }

  // Builders and communities by name (case and spacing ignored); unknown names are created only when confirmed.
  const [builders, communities] = await Promise.all([repo.listBuilders(deps.pool, viewer.companyId), repo.listCommunities(deps.pool, viewer.companyId)]);
  const builderByName = new Map(builders.map((b) => [nameKey(b.name), b]));
  const communityByName = new Map(communities.map((c) => [nameKey(c.name), c]));
  const communityById = new Map(communities.map((c) => [c.id, c]));
  const builderOf = new Map<Entry, Resolved>();
  const namedCommunityOf = new Map<Entry, Resolved>();
  for (const e of live()) {
    const c = e.candidate!;
    if (c.builder) {
      const known = builderByName.get(nameKey(c.builder));
      if (known) builderOf.set(e, { kind: 'known', id: known.id });
      else if (query.createBuilders) builderOf.set(e, { kind: 'new', name: c.builder });
      else reject(e, fieldOf('builder'), `"${c.builder}" is not one of your builders: fix the name, or confirm creating new builders`);
    }
    if (c.community && e.candidate) {
      const known = communityByName.get(nameKey(c.community));
      if (known) namedCommunityOf.set(e, { kind: 'known', id: known.id });
      else if (query.createCommunities) namedCommunityOf.set(e, { kind: 'new', name: c.community });
      else reject(e, fieldOf('community'), `"${c.community}" is not one of your communities: fix the name, or confirm creating new communities`);
    }
  }

  // Homes already at these addresses: re-imports update them, and keep their location unless the row gives one.
  const existing = await repo.homesByKey(deps.pool, viewer.companyId, live().map((e) => e.candidate!.addressKey));
  for (const e of live()) e.existing = existing.get(e.candidate!.addressKey);

  mark('check');
  // Geocode new addresses that came without coordinates; unmatched and tied ones are reported, never placed.
  const toGeocode = live().filter((e) => e.candidate!.lon === null && !e.existing);
  job.status = 'geocoding';
  job.progress.rowsToGeocode = toGeocode.length;
  if (toGeocode.length) {
    const answers = await deps.geocoder.geocode(
      toGeocode.map((e) => ({ id: String(e.row), street: geocodeLine(e.candidate!), city: e.candidate!.city, state: e.candidate!.state, zip: e.candidate!.zip })),
      (done) => (job.progress.rowsGeocoded = done),
    );
    for (const e of toGeocode) {
      const c = e.candidate!;
      const answer = answers.get(String(e.row)) ?? { kind: 'no_match' as const };
      const asked = `${geocodeLine(c)}, ${c.city}, ${c.state} ${c.zip}`;
      if (answer.kind === 'no_match') reject(e, fieldOf('address'), `the geocoder found no match for "${asked}": fix the address or add latitude and longitude`);
      else if (answer.kind === 'tie') reject(e, fieldOf('address'), `the geocoder found several places for "${asked}": make the street name complete or add latitude and longitude`);
      else if (!answer.exact && !sameStreetAddress(answer.matchedAddress, c)) {
        reject(e, fieldOf('address'), `the geocoder only found a similar address, "${answer.matchedAddress}": correct the row or add latitude and longitude`);
      } else {
        c.lon = answer.lon;
        c.lat = answer.lat;
      }
    }
  }

  mark('geocode');
  // Communities by boundary, in one query; the row's own community must agree with where the home is.
  job.status = 'assigning';
  const placed = live();
  const located = await repo.communitiesAt(
    deps.pool,
    viewer.companyId,
    placed.map((e) => ({ lon: e.candidate!.lon ?? e.existing!.lon, lat: e.candidate!.lat ?? e.existing!.lat })),
  );
  const communityName = (id: string) => communityById.get(id)?.name ?? 'another community';
  placed.forEach((e, i) => {
    const c = e.candidate!;
    const at = located[i];
    const named = namedCommunityOf.get(e);
    if (named?.kind === 'known' && at && named.id !== at) {
      reject(e, fieldOf('community'), `the address lies in "${communityName(at)}", not "${c.community}": check the community or the address`);
      return;
    }
    if (named?.kind === 'known' && !at && communityById.get(named.id)?.hasBoundary) {
      reject(e, fieldOf('community'), `the address lies outside the boundary of "${c.community}": check the community or the address`);
      return;
    }
    if (named?.kind === 'new' && at) {
      reject(e, fieldOf('community'), `the address lies in "${communityName(at)}", not the new community "${c.community}": check the community or the address`);
      return;
    }
    e.communityId = named?.kind === 'known' ? named.id : (at ?? e.existing?.communityId ?? null);
  });

  mark('assign');
  // Write: one transaction. New builders and communities, homes, the batch and what it changed.
  const survivors = live();
  job.status = 'writing';
  job.progress.rowsToWrite = survivors.length;
  const createdBuilderNames = uniqueNames([...builderOf.entries()].filter(([e, r]) => e.candidate && r.kind === 'new').map(([, r]) => (r as { name: string }).name));
  const createdCommunityNames = uniqueNames(
    [...namedCommunityOf.entries()].filter(([e, r]) => e.candidate && r.kind === 'new').map(([, r]) => (r as { name: string }).name),
  );

  const result = await repo.inTransaction(deps.pool, async (client) => {
    const newBuilders = await repo.createBuilders(client, viewer.companyId, createdBuilderNames);
    const newCommunities = await repo.createCommunities(client, viewer.companyId, createdCommunityNames);
    const newBuilderId = new Map(newBuilders.map((b) => [nameKey(b.name), b.id]));
    const newCommunityId = new Map(newCommunities.map((c) => [nameKey(c.name), c.id]));
    // A name created by someone else a moment ago resolves to their row.
    const lateBuilders = createdBuilderNames.filter((n) => !newBuilderId.has(nameKey(n)));
    const lateCommunities = createdCommunityNames.filter((n) => !newCommunityId.has(nameKey(n)));
    if (lateBuilders.length) for (const b of await repo.listBuilders(client, viewer.companyId)) if (!newBuilderId.has(nameKey(b.name))) newBuilderId.set(nameKey(b.name), b.id);
    if (lateCommunities.length) for (const c of await repo.listCommunities(client, viewer.companyId)) if (!newCommunityId.has(nameKey(c.name))) newCommunityId.set(nameKey(c.name), c.id);

    const valuesFor = (e: Entry, stored: repo.StoredHome | undefined): repo.HomeValues | null => {
      const c = e.candidate!;
      const namedCommunity = namedCommunityOf.get(e);
      const communityId = namedCommunity?.kind === 'new' ? newCommunityId.get(nameKey(namedCommunity.name))! : (e.communityId ?? null);
      const builder = builderOf.get(e);
      const rowBuilderId = builder ? (builder.kind === 'known' ? builder.id : newBuilderId.get(nameKey(builder.name))!) : null;
      // If the row does not say, a home takes its community's builder (when it has exactly one) and its year (when it spans one).
      const community = communityId ? communityById.get(communityId) : undefined;
      const communityBuilder = community && community.builderIds.length === 1 ? community.builderIds[0] : null;
      const communityYear = community && community.yearFrom !== null && community.yearFrom === community.yearTo ? community.yearFrom : null;
      const lon = c.lon ?? stored?.lon;
      const lat = c.lat ?? stored?.lat;
      if (lon === undefined || lat === undefined) return null;
      return {
        addressKey: c.addressKey,
        number: c.number,
        street: c.street,
        unit: c.unit,
        city: c.city,
        state: c.state,
        zip: c.zip,
        lon,
        lat,
        communityId,
        builderId: rowBuilderId ?? stored?.builderId ?? communityBuilder,
        yearBuilt: c.yearBuilt ?? stored?.yearBuilt ?? communityYear,
        foundation: c.foundation ?? stored?.foundation ?? null,
        ownerName: c.ownerName ?? stored?.ownerName ?? '',
        mailingAddress: c.mailingAddress ?? stored?.mailingAddress ?? '',
        doNotContact: c.doNotContact ?? stored?.doNotContact ?? false,
      };
    };

    // Lock the homes this file changes (as read before the transaction) and compare again under the lock.
    // Unchanged homes are neither locked nor written; a new address someone adds meanwhile trips the unique index.
    const changing = survivors.filter((e) => e.existing && !sameHome(e.existing, valuesFor(e, e.existing)!));
    const locked = await repo.homesByKey(client, viewer.companyId, changing.map((e) => e.candidate!.addressKey), true);
    const changingSet = new Set(changing);
    mark('lock');
    const inserts: { entry: Entry; values: repo.HomeValues }[] = [];
    const updates: { entry: Entry; values: repo.HomeValues; id: string }[] = [];
    const unchanged: string[] = [];
    for (const e of survivors) {
      if (e.existing && !changingSet.has(e)) {
        unchanged.push(e.existing.id);
        continue;
      }
      const stored = e.existing ? locked.get(e.candidate!.addressKey) : undefined;
      const values = valuesFor(e, stored);
      if (!values) {
        // The home this row matched was deleted while the import ran, and the row has no coordinates of its own.
        reject(e, fieldOf('address'), 'the home at this address was deleted while the import ran: import the row again');
        continue;
      }
      if (!stored) inserts.push({ entry: e, values });
      else if (sameHome(stored, values)) unchanged.push(stored.id);
      else updates.push({ entry: e, values, id: stored.id });
    }

    const errors = entries.flatMap((e) => e.errors).sort((a, b) => a.row - b.row);
    const rejectedEntries = entries.filter((e) => e.candidate === null);
    const counts = { rows: entries.length, inserted: inserts.length, updated: updates.length, unchanged: unchanged.length, rejected: rejectedEntries.length };
    const stored: StoredMapping = {
      fields: received.mapping,
      headers: received.headers,
      delimiter: received.delimiter,
      created: { builders: newBuilders, communities: newCommunities },
      rejectedRows: rejectedEntries.slice(0, REJECTED_ROWS_KEPT).map((e) => ({ row: e.row, cells: e.cells })),
    };
    await repo.insertBatch(client, { id: job.id, companyId: viewer.companyId, userId: viewer.id, fileName: job.fileName, mapping: stored, rowCount: counts.rows, ...counts, errors });
    await repo.recordPreviousRows(client, job.id, viewer.companyId, updates.map((u) => u.id));
    await repo.deferHomeCells(client);
    mark('batch');

    for (let i = 0; i < updates.length; i += WRITE_CHUNK) {
      await repo.updateHomes(client, viewer.companyId, updates.slice(i, i + WRITE_CHUNK).map((u) => u.values));
      job.progress.rowsWritten += Math.min(WRITE_CHUNK, updates.length - i);
    }
    // In address-key order: the unique index then fills from one end instead of at random.
    inserts.sort((a, b) => (a.values.addressKey < b.values.addressKey ? -1 : a.values.addressKey > b.values.addressKey ? 1 : 0));
    for (let i = 0; i < inserts.length; i += WRITE_CHUNK) {
      const chunk = inserts.slice(i, i + WRITE_CHUNK);
      try {
        await repo.insertHomes(client, viewer.companyId, job.id, chunk.map((x) => x.values));
      } catch (err) {
        if (repo.isAddressTaken(err)) throw AppError.conflict('Some of these addresses were added by someone else while the import ran; run the import again');
        throw err;
      }
      job.progress.rowsWritten += chunk.length;
    }
    await repo.refreshHomeCellsOfBatch(client, viewer.companyId, job.id);
    mark('homes');
    // Unchanged homes are counted, not recorded: undo has nothing to put back for them.
    job.progress.rowsWritten += unchanged.length;
    await repo.rememberMapping(client, viewer.companyId, headerKey(received.headers), received.mapping);
    mark('changes');
    return { counts, errors, created: { builders: newBuilders.map((b) => b.name), communities: newCommunities.map((c) => c.name) } };
  });
  mark('commit');
  logger.info('import committed', { importId: job.id, rows: entries.length, ms: timings });

  job.counts = result.counts;
  job.errors = result.errors;
  job.created = result.created;
  deps.jobs.finish(job, 'committed');
}

function uniqueNames(names: string[]): string[] {
  const seen = new Map<string, string>();
  for (const n of names) if (!seen.has(nameKey(n))) seen.set(nameKey(n), n.trim().replace(/\s+/g, ' '));
  return [...seen.values()];
}

/** A non-exact geocoder match is taken only when number and street are ours (just the city or ZIP differed). */
function sameStreetAddress(matched: string, c: ImportCandidate): boolean {
  const line = parseStreetLine(matched.split(',')[0] ?? '');
  return Boolean(line && line.number === c.number && normaliseStreet(line.street) === normaliseStreet(c.street));
}

const sameNumber = (a: number, b: number) => Math.abs(a - b) < 1e-12;

function sameHome(stored: repo.StoredHome, v: repo.HomeValues): boolean {
  return (
    stored.number === v.number &&
    stored.street === v.street &&
    (stored.unit ?? null) === v.unit &&
    stored.city === v.city &&
    stored.state === v.state &&
    stored.zip === v.zip &&
    sameNumber(stored.lon, v.lon) &&
    sameNumber(stored.lat, v.lat) &&
    stored.communityId === v.communityId &&
    stored.builderId === v.builderId &&
    stored.yearBuilt === v.yearBuilt &&
    stored.foundation === v.foundation &&
    stored.ownerName === v.ownerName &&
    stored.mailingAddress === v.mailingAddress &&
    stored.doNotContact === v.doNotContact
  );
}

// ---------------------------------------------------------------------------------------------------
// Undo
// ---------------------------------------------------------------------------------------------------

export async function undoImport(deps: ImportDeps, viewer: SessionUser, id: string): Promise<ImportDto> {
  await repo.inTransaction(deps.pool, async (client) => {
    const batch = await repo.findBatch(client, viewer.companyId, id, true);
    if (!batch) throw AppError.notFound('Import');
    if (batch.status === 'undone') throw AppError.conflict('This import has already been undone');
    await repo.lockBatchHomes(client, viewer.companyId, id);
    const blockers = await repo.undoBlockers(client, viewer.companyId, id);
    if (blockers.length) {
      const reasons = blockers.map((b) =>
        b.kind === 'later imports'
          ? `a later import ("${b.example}") changed the same homes: undo that one first`
          : `${b.n} ${b.n === 1 ? 'home has' : 'homes have'} ${b.kind === 'visits' ? 'a visit recorded' : b.kind === 'tests' ? 'a radon test recorded' : 'been edited'} since the import (e.g. ${b.example})`,
      );
      throw AppError.conflict(`This import can no longer be undone exactly: ${reasons.join('; ')}`);
    }
    const created = (batch.mapping as Partial<StoredMapping>).created;
    const createdBuilders = (created?.builders ?? []).map((b) => b.id);
    const createdCommunities = (created?.communities ?? []).map((c) => c.id);
    await repo.lockCreated(client, viewer.companyId, createdBuilders, createdCommunities);
    await repo.revertBatch(client, viewer.companyId, id);
    await repo.deleteCreatedIfUnused(client, viewer.companyId, createdBuilders, createdCommunities);
    await repo.markUndone(client, id);
  });
  const job = deps.jobs.get(id);
  if (job) job.status = 'undone';
  return getImport(deps, viewer, id);
}

// ---------------------------------------------------------------------------------------------------
// Error CSV
// ---------------------------------------------------------------------------------------------------

/**
 * The rejected rows as they were in the file, with their row number and problems in two added columns:
 * fix them in a spreadsheet and import the file again. Every cell is neutralised against formula injection.
 */
export async function errorCsv(deps: ImportDeps, viewer: SessionUser, id: string): Promise<{ fileName: string; csv: string }> {
  const batch = await repo.findBatch(deps.pool, viewer.companyId, id);
  if (!batch) throw AppError.notFound('Import');
  const mapping = batch.mapping as Partial<StoredMapping>;
  const headers = mapping.headers ?? [];
  const problemsByRow = new Map<number, string[]>();
  for (const e of batch.errors) problemsByRow.set(e.row, [...(problemsByRow.get(e.row) ?? []), `${e.field}: ${e.reason}`]);
  const rows: string[][] = [[...headers, 'Import row', 'Import problems']];
  const kept = new Set<number>();
  for (const r of mapping.rejectedRows ?? []) {
    kept.add(r.row);
    const cells = headers.map((_, i) => r.cells[i] ?? '');
    rows.push([...cells, String(r.row), (problemsByRow.get(r.row) ?? []).join('; ')]);
  }
  // Rows past the kept limit still get a line with their number and problems.
  for (const [row, problems] of problemsByRow) if (!kept.has(row)) rows.push([...headers.map(() => ''), String(row), problems.join('; ')]);
  const base = batch.fileName.replace(/\.(csv|txt|tsv)$/i, '');
  return { fileName: `${base}-errors.csv`, csv: toSafeCsv(rows) };
}

// ---------------------------------------------------------------------------------------------------
// Reading back
// ---------------------------------------------------------------------------------------------------

function jobDto(job: ImportJob): ImportDto {
  const errors = [...job.errors].sort((a, b) => a.row - b.row);
  return {
    id: job.id,
    fileName: job.fileName,
    status: job.status,
    userName: job.userName,
    createdAt: job.createdAt.toISOString(),
    undoneAt: null,
    progress: { ...job.progress },
    counts: job.counts,
    errors: errors.slice(0, ERRORS_SHOWN),
    errorCount: errors.length,
    failure: job.failure,
    created: job.created,
  };
}

function batchDto(b: repo.BatchRow): ImportDto {
  const created = (b.mapping as Partial<StoredMapping>).created ?? { builders: [], communities: [] };
  const written = b.insertedCount + b.updatedCount + b.unchangedCount;
  return {
    id: b.id,
    fileName: b.fileName,
    status: b.status,
    userName: b.userName,
    createdAt: b.createdAt.toISOString(),
    undoneAt: b.undoneAt ? b.undoneAt.toISOString() : null,
    progress: { rowsParsed: b.rowCount, rowsToGeocode: 0, rowsGeocoded: 0, rowsToWrite: written, rowsWritten: written },
    counts: { rows: b.rowCount, inserted: b.insertedCount, updated: b.updatedCount, unchanged: b.unchangedCount, rejected: b.rejectedCount },
    errors: b.errors.slice(0, ERRORS_SHOWN),
    errorCount: b.errorCount ?? b.errors.length,
    failure: null,
    created: { builders: created.builders.map((x) => x.name), communities: created.communities.map((x) => x.name) },
  };
}

export async function getImport(deps: ImportDeps, viewer: SessionUser, id: string): Promise<ImportDto> {
  const job = deps.jobs.get(id);
  if (job && job.companyId === viewer.companyId && job.status !== 'committed' && job.status !== 'undone') return jobDto(job);
  const batch = await repo.findBatch(deps.pool, viewer.companyId, id);
  if (!batch) throw AppError.notFound('Import');
  return batchDto(batch);
}

export async function listImports(deps: ImportDeps, viewer: SessionUser): Promise<ImportDto[]> {
  const [batches, pending] = [await repo.listBatches(deps.pool, viewer.companyId, 100), deps.jobs.pending(viewer.companyId)];
  return [...pending.map(jobDto), ...batches.map((b) => batchDto(b))];
}

