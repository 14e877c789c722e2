import { sql } from 'drizzle-orm';
import {
  bigint,
  boolean,
  check,
  date,
  doublePrecision,
  index,
  integer,
  jsonb,
  pgTable,
  primaryKey,
  text,
  timestamp,
  uniqueIndex,
  uuid,
  varchar,
  json,
} from 'drizzle-orm/pg-core';
import { bytes, multiPolygonGeometry, pointGeometry } from './columns.js';

const id = () => uuid('id').primaryKey().defaultRandom();
const createdAt = () => timestamp('created_at', { withTimezone: true }).notNull().defaultNow();
const inList = (column: string, values: readonly (string | number)[]) =>
  sql.raw(`${column} in (${values.map((v) => (typeof v === 'number' ? v : `'${v}'`)).join(', ')})`);

/** A tenant. Settings live on the row: the action level defaults to EPA's 4 pCi/L = 148 Bq/m³. */
export const companies = pgTable(
  'companies',
  {
    id: id(),
    name: text('name').notNull(),
    actionLevelBqM3: doublePrecision('action_level_bq_m3').notNull().default(148),
    considerLevelBqM3: doublePrecision('consider_level_bq_m3').notNull().default(74),
    radonUnit: text('radon_unit').notNull().default('pCi/L'),
    activationPriceCents: integer('activation_price_cents').notNull().default(95000),
    reworkPriceCents: integer('rework_price_cents').notNull().default(65000),
    quoteConfidence: doublePrecision('quote_confidence').notNull().default(0.9),
    pfeTargetPa: doublePrecision('pfe_target_pa').notNull().default(1),
    /**
     * Goes up, by trigger, with every statement that changes the company's homes or sampling plans:
     * the homes-tile cache keys on it, so no write path can forget to invalidate the map.
     */
    homesVersion: bigint('homes_version', { mode: 'number' }).notNull().default(0),
    createdAt: createdAt(),
  },
  (t) => [
    check('companies_action_level_positive', sql`${t.actionLevelBqM3} > 0`),
    check('companies_consider_level_positive', sql`${t.considerLevelBqM3} > 0`),
    check('companies_radon_unit', inList('radon_unit', ['pCi/L', 'Bq/m3'])),
    check('companies_prices_non_negative', sql`${t.activationPriceCents} >= 0 and ${t.reworkPriceCents} >= 0`),
    check('companies_quote_confidence', sql`${t.quoteConfidence} > 0 and ${t.quoteConfidence} < 1`),
    check('companies_pfe_target_positive', sql`${t.pfeTargetPa} > 0`),
  ],
);

export const users = pgTable(
  'users',
  {
    id: id(),
    companyId: uuid('company_id')
      .notNull()
      .references(() => companies.id, { onDelete: 'cascade' }),
    email: text('email').notNull(),
    name: text('name').notNull(),
    role: text('role').notNull(),
    passwordHash: text('password_hash').notNull(),
    active: boolean('active').notNull().default(true),
    createdAt: createdAt(),
  },
  (t) => [
    uniqueIndex('users_email_unique').on(sql`lower(${t.email})`),
    index('users_company_idx').on(t.companyId),
    check('users_role', inList('role', ['admin', 'manager', 'estimator', 'technician', 'sales'])),
  ],
);

export const builders = pgTable(
  'builders',
  {
    id: id(),
    companyId: uuid('company_id')
      .notNull()
      .references(() => companies.id, { onDelete: 'cascade' }),
    name: text('name').notNull(),
    notes: text('notes').notNull().default(''),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex('builders_company_name_unique').on(t.companyId, sql`lower(${t.name})`)],
);

export const communities = pgTable(
  'communities',
  {
    id: id(),
    companyId: uuid('company_id')
      .notNull()
      .references(() => companies.id, { onDelete: 'cascade' }),
    name: text('name').notNull(),
    boundary: multiPolygonGeometry('boundary'),
    yearFrom: integer('year_from'),
    yearTo: integer('year_to'),
    jurisdiction: text('jurisdiction').notNull().default(''),
    passiveRequired: boolean('passive_required'),
    createdAt: createdAt(),
  },
  (t) => [
    uniqueIndex('communities_company_name_unique').on(t.companyId, sql`lower(${t.name})`),
    index('communities_boundary_gist').using('gist', t.boundary),
    check('communities_years_in_order', sql`${t.yearFrom} is null or ${t.yearTo} is null or ${t.yearFrom} <= ${t.yearTo}`),
  ],
);

export const communityBuilders = pgTable(
  'community_builders',
  {
    communityId: uuid('community_id')
      .notNull()
      .references(() => communities.id, { onDelete: 'cascade' }),
    builderId: uuid('builder_id')
      .notNull()
      .references(() => builders.id, { onDelete: 'cascade' }),
  },
  (t) => [primaryKey({ columns: [t.communityId, t.builderId] })],
);

export const homes = pgTable(
  'homes',
  {
    id: id(),
    companyId: uuid('company_id')
      .notNull()
      .references(() => companies.id, { onDelete: 'cascade' }),
    communityId: uuid('community_id').references(() => communities.id, { onDelete: 'set null' }),
    builderId: uuid('builder_id').references(() => builders.id, { onDelete: 'set null' }),
    number: text('number').notNull(),
    street: text('street').notNull(),
    unit: text('unit'),
    city: text('city').notNull(),
    state: text('state').notNull(),
    zip: text('zip').notNull(),
    /** Normalised address used to match re-imports (one home per address per company). */
    addressKey: text('address_key').notNull(),
    location: pointGeometry('location').notNull(),
    /** A short number of its own: the home's feature id in map tiles (a uuid would triple a tile's size). */
    ref: bigint('ref', { mode: 'number' }).notNull().generatedAlwaysAsIdentity(),
    /**
     * Web Mercator (EPSG:3857) metres of the location, kept so a map tile projects no home at request time.
     * The spherical Mercator formulas (sphere of radius 6378137 m), as ST_Transform(location, 3857) gives
     * them to within nanometres at a quarter of the cost; latitude held to the square's ±85.0511°.
     */
    mercX: doublePrecision('merc_x').generatedAlwaysAs(sql`ST_X(location) * 20037508.342789244 / 180`),
    mercY: doublePrecision('merc_y').generatedAlwaysAs(
      sql`ln(tan(radians(90 + least(greatest(ST_Y(location), -85.0511287798066), 85.0511287798066)) / 2)) * 6378137`,
    ),
    yearBuilt: integer('year_built'),
    foundation: text('foundation'),
    passiveSystem: text('passive_system').notNull().default('unknown'),
    pipeSizeIn: integer('pipe_size_in'),
    suctionPointNote: text('suction_point_note').notNull().default(''),
    footprint: jsonb('footprint'),
    ownerName: text('owner_name').notNull().default(''),
    mailingAddress: text('mailing_address').notNull().default(''),
    doNotContact: boolean('do_not_contact').notNull().default(false),
    /** Derived from visits and tests by shared/domain/outcome.ts; never typed in by hand. */
    outcome: text('outcome').notNull().default('not_visited'),
    /** Kept with the outcome for map styling and statistics without joining every visit. */
    lastVacuumPa: doublePrecision('last_vacuum_pa'),
    lastPostBqM3: doublePrecision('last_post_bq_m3'),
    reworkFlag: boolean('rework_flag').notNull().default(false),
    /** Derived: every rework reason cited by the home's completed visits (distinct, sorted). */
    reworkReasons: text('rework_reasons').array().notNull().default(sql`'{}'::text[]`),
    sampled: boolean('sampled').notNull().default(false),
    failed: boolean('failed').notNull().default(false),
    createdAt: createdAt(),
    updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    uniqueIndex('homes_company_address_unique').on(t.companyId, t.addressKey),
    uniqueIndex('homes_ref_unique').on(t.ref),
    // homes_tile_idx (company_id, merc_x, merc_y) INCLUDE (…): a covering index, written in migration 0008.
    index('homes_company_community_idx').on(t.companyId, t.communityId),
    index('homes_company_builder_year_idx').on(t.companyId, t.builderId, t.yearBuilt),
    index('homes_company_outcome_idx').on(t.companyId, t.outcome),
    check('homes_year_built', sql`${t.yearBuilt} is null or ${t.yearBuilt} between 1800 and 2100`),
    check('homes_foundation', sql`foundation is null or ${inList('foundation', ['slab', 'basement', 'crawlspace', 'mixed'])}`),
    check('homes_passive_system', inList('passive_system', ['yes', 'no', 'unknown'])),
    check('homes_pipe_size', sql`pipe_size_in is null or pipe_size_in in (3, 4)`),
    check(
      'homes_outcome',
      inList('outcome', ['not_visited', 'awaiting_test', 'below_action_level', 'needs_rework', 'reworked_below', 'declined']),
    ),
    check('homes_location_in_range', sql`ST_X(location) between -180 and 180 and ST_Y(location) between -90 and 90`),
  ],
);

/** A fan model the company installs, with its curve from the maker's data sheet (static pressure vs airflow). */
export const fans = pgTable(
  'fans',
  {
    id: id(),
    companyId: uuid('company_id')
      .notNull()
      .references(() => companies.id, { onDelete: 'cascade' }),
    name: text('name').notNull(),
    maxStaticInWc: doublePrecision('max_static_in_wc').notNull(),
    curve: jsonb('curve').notNull(),
    createdAt: createdAt(),
  },
  (t) => [
    uniqueIndex('fans_company_name_unique').on(t.companyId, sql`lower(${t.name})`),
    check('fans_max_static_positive', sql`${t.maxStaticInWc} > 0`),
  ],
);

/** An activation visit. The id may be generated on the device so a retried upload is stored once. */
export const visits = pgTable(
  'visits',
  {
    id: uuid('id').primaryKey(),
    companyId: uuid('company_id')
      .notNull()
      .references(() => companies.id, { onDelete: 'cascade' }),
    homeId: uuid('home_id')
      .notNull()
      .references(() => homes.id, { onDelete: 'cascade' }),
    technicianId: uuid('technician_id').references(() => users.id, { onDelete: 'set null' }),
    visitedOn: date('visited_on').notNull(),
    status: text('status').notNull(),
    fanId: uuid('fan_id').references(() => fans.id, { onDelete: 'set null' }),
    fanLocation: text('fan_location').notNull().default(''),
    fanActivatedAt: timestamp('fan_activated_at', { withTimezone: true }),
    /** Manometer vacuum stored in Pa (1 in. WC = 249.0889 Pa, NIST SP 811 B.8 conventional). */
    vacuumPa: doublePrecision('vacuum_pa'),
    laterVacuumPa: doublePrecision('later_vacuum_pa'),
    pipeSizeIn: integer('pipe_size_in'),
    pipeLengthFt: doublePrecision('pipe_length_ft'),
    elbows: integer('elbows'),
    pipeEntry: text('pipe_entry').notNull().default(''),
    subSlabMaterial: text('sub_slab_material').notNull().default('unknown'),
    pressureField: jsonb('pressure_field').notNull().default(sql`'[]'::jsonb`),
    reworkNeeded: boolean('rework_needed').notNull().default(false),
    reworkDone: boolean('rework_done').notNull().default(false),
    reworkReasons: text('rework_reasons').array().notNull().default(sql`'{}'::text[]`),
    notes: text('notes').notNull().default(''),
    createdAt: createdAt(),
  },
  (t) => [
    index('visits_company_home_idx').on(t.companyId, t.homeId),
    check('visits_status', inList('status', ['completed', 'declined', 'no_access'])),
    check('visits_vacuum_non_negative', sql`${t.vacuumPa} is null or ${t.vacuumPa} >= 0`),
    check('visits_later_vacuum_non_negative', sql`${t.laterVacuumPa} is null or ${t.laterVacuumPa} >= 0`),
    check('visits_pipe_size', sql`pipe_size_in is null or pipe_size_in in (3, 4)`),
    check('visits_pipe_length_non_negative', sql`${t.pipeLengthFt} is null or ${t.pipeLengthFt} >= 0`),
    check('visits_elbows_non_negative', sql`${t.elbows} is null or ${t.elbows} >= 0`),
    check('visits_sub_slab', inList('sub_slab_material', ['clean_gravel', 'mixed', 'none', 'unknown'])),
  ],
);

export const radonTests = pgTable(
  'radon_tests',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    companyId: uuid('company_id')
      .notNull()
      .references(() => companies.id, { onDelete: 'cascade' }),
    homeId: uuid('home_id')
      .notNull()
      .references(() => homes.id, { onDelete: 'cascade' }),
    visitId: uuid('visit_id').references(() => visits.id, { onDelete: 'set null' }),
    kind: text('kind').notNull(),
    device: text('device').notNull(),
    startedAt: timestamp('started_at', { withTimezone: true }).notNull(),
    endedAt: timestamp('ended_at', { withTimezone: true }).notNull(),
    /** Stored exactly in Bq/m³ (ANSI/AARST MAH-2019 §7.1); pCi/L is a display unit (× 37). */
    resultBqM3: doublePrecision('result_bq_m3').notNull(),
    sideBySideGroup: text('side_by_side_group'),
    createdAt: createdAt(),
  },
  (t) => [
    index('radon_tests_company_home_idx').on(t.companyId, t.homeId),
    check('radon_tests_kind', inList('kind', ['pre', 'post'])),
    check('radon_tests_device', inList('device', ['continuous_monitor', 'charcoal', 'alpha_track', 'electret'])),
    check('radon_tests_ends_after_start', sql`${t.endedAt} > ${t.startedAt}`),
    check('radon_tests_result_non_negative', sql`${t.resultBqM3} >= 0`),
  ],
);

/** Photos and lab reports; the bytes live in object storage and are streamed after an authorisation check. */
export const attachments = pgTable(
  'attachments',
  {
    id: id(),
    companyId: uuid('company_id')
      .notNull()
      .references(() => companies.id, { onDelete: 'cascade' }),
    homeId: uuid('home_id')
      .notNull()
      .references(() => homes.id, { onDelete: 'cascade' }),
    visitId: uuid('visit_id').references(() => visits.id, { onDelete: 'cascade' }),
    radonTestId: uuid('radon_test_id').references(() => radonTests.id, { onDelete: 'cascade' }),
    kind: text('kind').notNull(),
    contentType: text('content_type').notNull(),
    byteSize: integer('byte_size').notNull(),
    storageKey: text('storage_key').notNull(),
    /** What a photo shows; lab reports have none. */
    subject: text('subject'),
    /** The JPEG preview made for photos (at most 320 px), stored beside the original. */
    thumbnailKey: text('thumbnail_key'),
    originalName: text('original_name').notNull().default(''),
    createdAt: createdAt(),
  },
  (t) => [
    index('attachments_company_home_idx').on(t.companyId, t.homeId),
    index('attachments_visit_idx').on(t.visitId),
    index('attachments_radon_test_idx').on(t.radonTestId),
    check('attachments_kind', inList('kind', ['photo', 'lab_report'])),
    check('attachments_size_positive', sql`${t.byteSize} > 0`),
    check('attachments_subject', sql`subject is null or (kind = 'photo' and ${inList('subject', ['manometer', 'fan', 'suction_point', 'other'])})`),
  ],
);

/** connect-pg-simple's table, declared so migrations own it (see its table.sql). */
export const session = pgTable(
  'session',
  {
    sid: varchar('sid').primaryKey(),
    sess: json('sess').notNull(),
    expire: timestamp('expire', { precision: 6 }).notNull(),
  },
  (t) => [index('IDX_session_expire').on(t.expire)],
);

/** One CSV import: all valid rows written in one transaction, undoable while no visit touches its homes. */
export const importBatches = pgTable(
  'import_batches',
  {
    id: id(),
    companyId: uuid('company_id')
      .notNull()
      .references(() => companies.id, { onDelete: 'cascade' }),
    userId: uuid('user_id').references(() => users.id, { onDelete: 'set null' }),
    fileName: text('file_name').notNull(),
    status: text('status').notNull().default('committed'),
    mapping: jsonb('mapping').notNull(),
    rowCount: integer('row_count').notNull(),
    insertedCount: integer('inserted_count').notNull().default(0),
    updatedCount: integer('updated_count').notNull().default(0),
    unchangedCount: integer('unchanged_count').notNull().default(0),
    rejectedCount: integer('rejected_count').notNull().default(0),
    /** Row errors as reported to the user: [{ row, field, reason }]. */
    errors: jsonb('errors').notNull().default(sql`'[]'::jsonb`),
    createdAt: createdAt(),
    undoneAt: timestamp('undone_at', { withTimezone: true }),
  },
  (t) => [
    index('import_batches_company_idx').on(t.companyId, t.createdAt),
    check('import_batches_status', inList('status', ['committed', 'undone'])),
  ],
);

/** What an import did to each home, with the row as it was before, so undo can restore it exactly. */
export const importChanges = pgTable(
  'import_changes',
  {
    batchId: uuid('batch_id')
      .notNull()
      .references(() => importBatches.id, { onDelete: 'cascade' }),
    homeId: uuid('home_id').notNull(),
    action: text('action').notNull(),
    previous: jsonb('previous'),
  },
  (t) => [
    primaryKey({ columns: [t.batchId, t.homeId] }),
    index('import_changes_home_idx').on(t.homeId),
    check('import_changes_action', inList('action', ['inserted', 'updated', 'unchanged'])),
  ],
);

/** The column mapping a company used for a file with these headers, offered again next time. */
export const columnMappings = pgTable(
  'column_mappings',
  {
    companyId: uuid('company_id')
      .notNull()
      .references(() => companies.id, { onDelete: 'cascade' }),
    headerKey: text('header_key').notNull(),
    mapping: jsonb('mapping').notNull(),
    updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [primaryKey({ columns: [t.companyId, t.headerKey] })],
);

/**
 * When the homes drawn in one homes tile last changed (migration 0008): statement-level triggers give
 * each tile a change touches (its own, and a neighbour whose margin shows the home) a new version.
 * A tile is cached under this version and companies.homes_version, which covers changes too wide to
 * list tile by tile (sampling plans, statements of more than 2,000 homes).
 */
export const homeTileVersions = pgTable(
  'home_tile_versions',
  {
    companyId: uuid('company_id')
      .notNull()
      .references(() => companies.id, { onDelete: 'cascade' }),
    z: integer('z').notNull(),
    x: integer('x').notNull(),
    y: integer('y').notNull(),
    version: bigint('version', { mode: 'number' }).notNull(),
  },
  (t) => [primaryKey({ columns: [t.companyId, t.z, t.x, t.y] })],
);

/**
 * The map's overview marks, kept by database triggers (migration 0008): for each zoom below
 * HOMES_DETAIL_MIN_ZOOM, one row per 64-unit cell of the tile grid (8 px on screen) that holds any of a
 * company's homes. An unfiltered overview tile reads a few thousand of these instead of tens of
 * thousands of homes. Cell column and row come from merc_cell() over the home's Web Mercator metres.
 */
export const homeCells = pgTable(
  'home_cells',
  {
    companyId: uuid('company_id')
      .notNull()
      .references(() => companies.id, { onDelete: 'cascade' }),
    z: integer('z').notNull(),
    cx: integer('cx').notNull(),
    cy: integer('cy').notNull(),
    homes: integer('homes').notNull(),
    /** The outcome most in need of attention, as its 1-based rank in OUTCOME_PRIORITY (outcome_attention_rank()). */
    outcomeRank: integer('outcome_rank').notNull(),
    yearMin: integer('year_min'),
    vacuumSumPa: doublePrecision('vacuum_sum_pa'),
    vacuumCount: integer('vacuum_count').notNull(),
    postMaxBqM3: doublePrecision('post_max_bq_m3'),
    rework: boolean('rework').notNull(),
  },
  (t) => [primaryKey({ columns: [t.companyId, t.z, t.cx, t.cy] })],
);

/**
 * Unfiltered homes tiles from zoom 11 to 14, encoded (Mapbox Vector Tile) when the homes or sampling
 * plans they draw change, by the same database triggers that keep home_cells (migration 0009). A tile
 * with no homes has no row. Filtered tiles and the deeper zooms are built on request by the same SQL
 * function, homes_tile_mvt().
 */
export const homeTiles = pgTable(
  'home_tiles',
  {
    companyId: uuid('company_id')
      .notNull()
      .references(() => companies.id, { onDelete: 'cascade' }),
    z: integer('z').notNull(),
    x: integer('x').notNull(),
    y: integer('y').notNull(),
    mvt: bytes('mvt').notNull(),
  },
  (t) => [primaryKey({ columns: [t.companyId, t.z, t.x, t.y] })],
);

/** A plan of which homes to sample in a community (Cochran sample size, spatially spread). */
export const samplingPlans = pgTable(
  'sampling_plans',
  {
    id: id(),
    companyId: uuid('company_id')
      .notNull()
      .references(() => companies.id, { onDelete: 'cascade' }),
    communityId: uuid('community_id')
      .notNull()
      .references(() => communities.id, { onDelete: 'cascade' }),
    marginOfError: doublePrecision('margin_of_error').notNull(),
    expectedRate: doublePrecision('expected_rate').notNull(),
    sampleSize: integer('sample_size').notNull(),
    createdBy: uuid('created_by').references(() => users.id, { onDelete: 'set null' }),
    createdAt: createdAt(),
  },
  (t) => [
    index('sampling_plans_company_community_idx').on(t.companyId, t.communityId),
    check('sampling_plans_margin', sql`${t.marginOfError} > 0 and ${t.marginOfError} < 1`),
    check('sampling_plans_rate', sql`${t.expectedRate} >= 0 and ${t.expectedRate} <= 1`),
    check('sampling_plans_size', sql`${t.sampleSize} >= 0`),
  ],
);

export const samplingPlanHomes = pgTable(
  'sampling_plan_homes',
  {
    planId: uuid('plan_id')
      .notNull()
      .references(() => samplingPlans.id, { onDelete: 'cascade' }),
    homeId: uuid('home_id')
      .notNull()
      .references(() => homes.id, { onDelete: 'cascade' }),
  },
  (t) => [primaryKey({ columns: [t.planId, t.homeId] }), index('sampling_plan_homes_home_idx').on(t.homeId)],
);

/** A community quote: the figures are frozen at creation so an approved quote never changes under you. */
export const quotes = pgTable(
  'quotes',
  {
    id: id(),
    companyId: uuid('company_id')
      .notNull()
      .references(() => companies.id, { onDelete: 'cascade' }),
    communityId: uuid('community_id')
      .notNull()
      .references(() => communities.id, { onDelete: 'cascade' }),
    status: text('status').notNull().default('draft'),
    homesTotal: integer('homes_total').notNull(),
    homesSampled: integer('homes_sampled').notNull(),
    failuresSampled: integer('failures_sampled').notNull(),
    priorAlpha: doublePrecision('prior_alpha').notNull(),
    priorBeta: doublePrecision('prior_beta').notNull(),
    pooled: boolean('pooled').notNull().default(false),
    confidence: doublePrecision('confidence').notNull(),
    activationPriceCents: integer('activation_price_cents').notNull(),
    reworkPriceCents: integer('rework_price_cents').notNull(),
    expectedReworks: doublePrecision('expected_reworks').notNull(),
    upperReworks: integer('upper_reworks').notNull(),
    priceExpectedCents: integer('price_expected_cents').notNull(),
    priceUpperCents: integer('price_upper_cents').notNull(),
    recipientEmail: text('recipient_email'),
    createdBy: uuid('created_by').references(() => users.id, { onDelete: 'set null' }),
    createdAt: createdAt(),
    approvedBy: uuid('approved_by').references(() => users.id, { onDelete: 'set null' }),
    approvedAt: timestamp('approved_at', { withTimezone: true }),
    sentAt: timestamp('sent_at', { withTimezone: true }),
    decidedAt: timestamp('decided_at', { withTimezone: true }),
  },
  (t) => [
    index('quotes_company_idx').on(t.companyId, t.createdAt),
    check('quotes_status', inList('status', ['draft', 'approved', 'sent', 'accepted', 'declined'])),
    check('quotes_counts', sql`${t.homesSampled} >= 0 and ${t.failuresSampled} >= 0 and ${t.failuresSampled} <= ${t.homesSampled} and ${t.homesSampled} <= ${t.homesTotal}`),
  ],
);
