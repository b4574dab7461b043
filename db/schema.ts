import { relations, sql } from 'drizzle-orm';
import {
  boolean,
  type AnyPgColumn,
  customType,
  doublePrecision,
  index,
  integer,
  json,
  jsonb,
  pgEnum,
  pgTable,
  primaryKey,
  text,
  timestamp,
  uniqueIndex,
  uuid,
} from 'drizzle-orm/pg-core';
import type { BillQuantities } from '@/lib/boq/quantities';
import type { CandidateRow } from '@/lib/lines/candidate-row';
import type { LineListDiff } from '@/lib/lines/diff';
import type { ColumnMapping } from '@/lib/lines/mapping';
import type { ParsedFile } from '@/lib/lines/parse';
import type { StoredDesign, StoredLayer, StoredOutcome, StoredTracing } from '@/lib/lines/stored-result';
import type { DesignParts } from '@/lib/lines/vessel-parts';
import type { Flag } from '@/lib/review/flags';
import type { ReviewSnapshot } from '@/lib/review/snapshot';
import type { LineTableView } from '@/lib/preferences/line-table-view';

const bytea = customType<{ data: Buffer; driverData: Buffer }>({ dataType: () => 'bytea' });

export const roleEnum = pgEnum('member_role', ['owner', 'engineer', 'reviewer', 'contractor']);
export type Role = (typeof roleEnum.enumValues)[number];

export const users = pgTable(
  'users',
  {
    id: text('id').primaryKey(),
    email: text('email').notNull(),
    name: text('name').notNull(),
    passwordHash: text('password_hash'),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [uniqueIndex('users_email_key').on(sql`lower(${t.email})`)],
);

export const sessions = pgTable(
  'sessions',
  {
    id: text('id').primaryKey(),
    userId: text('user_id')
      .notNull()
      .references(() => users.id, { onDelete: 'cascade' }),
    expiresAt: timestamp('expires_at', { withTimezone: true, mode: 'date' }).notNull(),
  },
  (t) => [index('sessions_user_idx').on(t.userId)],
);

export const organizations = pgTable('organizations', {
  id: uuid('id').primaryKey().defaultRandom(),
  name: text('name').notNull(),
  createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
});

export const memberships = pgTable(
  'memberships',
  {
    organizationId: uuid('organization_id')
      .notNull()
      .references(() => organizations.id, { onDelete: 'cascade' }),
    userId: text('user_id')
      .notNull()
      .references(() => users.id, { onDelete: 'cascade' }),
    role: roleEnum('role').notNull(),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [primaryKey({ columns: [t.organizationId, t.userId] }), index('memberships_user_idx').on(t.userId)],
);

export const projects = pgTable(
  'projects',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    organizationId: uuid('organization_id')
      .notNull()
      .references(() => organizations.id, { onDelete: 'cascade' }),
    code: text('code').notNull(),
    name: text('name').notNull(),
    site: text('site').notNull().default(''),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [uniqueIndex('projects_org_code_key').on(t.organizationId, t.code)],
);

export const invitations = pgTable('invitations', {
  id: uuid('id').primaryKey().defaultRandom(),
  organizationId: uuid('organization_id')
    .notNull()
    .references(() => organizations.id, { onDelete: 'cascade' }),
  email: text('email').notNull(),
  role: roleEnum('role').notNull(),
  tokenHash: text('token_hash').notNull().unique(),
  invitedBy: text('invited_by')
    .notNull()
    .references(() => users.id, { onDelete: 'cascade' }),
  expiresAt: timestamp('expires_at', { withTimezone: true }).notNull(),
  acceptedAt: timestamp('accepted_at', { withTimezone: true }),
  revokedAt: timestamp('revoked_at', { withTimezone: true }),
  createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
});

export const passwordResets = pgTable('password_resets', {
  tokenHash: text('token_hash').primaryKey(),
  userId: text('user_id')
    .notNull()
    .references(() => users.id, { onDelete: 'cascade' }),
  expiresAt: timestamp('expires_at', { withTimezone: true }).notNull(),
  usedAt: timestamp('used_at', { withTimezone: true }),
  createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
});

/**
 * A sign-up waiting for its e-mail to be confirmed. Sign-up answers the same for known and unknown
 * addresses, so the account (and its organization) is created only from the mailed link.
 */
export const signupRequests = pgTable('signup_requests', {
  tokenHash: text('token_hash').primaryKey(),
  email: text('email').notNull(),
  name: text('name').notNull(),
  organizationName: text('organization_name').notNull(),
  passwordHash: text('password_hash').notNull(),
  expiresAt: timestamp('expires_at', { withTimezone: true }).notNull(),
  createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
});

/** One row per failed sign-in; throttling counts these per account and per IP. */
/**
 * Sign-in attempt counters, one row per throttle key (an account, an account at an address, an
 * address): failures counted before the password is checked (so parallel tries cannot slip past
 * the limit), and the time until which the key is refused. See lib/auth/throttle.ts.
 */
export const signInThrottle = pgTable('sign_in_throttle', {
  key: text('key').primaryKey(),
  failures: integer('failures').notNull().default(0),
  lastFailureAt: timestamp('last_failure_at', { withTimezone: true }).notNull().defaultNow(),
  blockedUntil: timestamp('blocked_until', { withTimezone: true }),
});

export const geometryEnum = pgEnum('line_geometry', ['horizontal-pipe', 'vertical-pipe', 'vessel', 'flat']);

/** The project's design basis; every saved change bumps the revision, which marks results stale. */
export const designBases = pgTable('design_bases', {
  projectId: uuid('project_id')
    .primaryKey()
    .references(() => projects.id, { onDelete: 'cascade' }),
  revision: integer('revision').notNull().default(1),
  /** Parsed by `designBasisSchema` on read: bases saved by earlier versions gain their defaults there. */
  basis: jsonb('basis').$type<unknown>().notNull(),
  updatedBy: text('updated_by').references(() => users.id, { onDelete: 'set null' }),
  updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
});

/** Column mapping remembered per project for the next revision. */
export const columnMappings = pgTable('column_mappings', {
  projectId: uuid('project_id')
    .primaryKey()
    .references(() => projects.id, { onDelete: 'cascade' }),
  headers: jsonb('headers').$type<string[]>().notNull(),
  mapping: jsonb('mapping').$type<ColumnMapping>().notNull(),
  updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
});

/** An uploaded file, parsed, waiting for mapping and import. */
export const importDrafts = pgTable('import_drafts', {
  id: uuid('id').primaryKey().defaultRandom(),
  projectId: uuid('project_id')
    .notNull()
    .references(() => projects.id, { onDelete: 'cascade' }),
  createdBy: text('created_by')
    .notNull()
    .references(() => users.id, { onDelete: 'cascade' }),
  fileName: text('file_name').notNull(),
  // json, not jsonb: the sheet's cells are read back whole, never queried inside (see line_results).
  parsed: json('parsed').$type<ParsedFile>().notNull(),
  importedRevision: integer('imported_revision'),
  /** The uploaded file as uploaded (lib/storage/documents.ts): object key, SHA-256 and size; null before documents were kept. */
  originalKey: text('original_key'),
  originalSha256: text('original_sha256'),
  originalBytes: integer('original_bytes'),
  createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
});

export const lineListRevisions = pgTable(
  'line_list_revisions',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    projectId: uuid('project_id')
      .notNull()
      .references(() => projects.id, { onDelete: 'cascade' }),
    number: integer('number').notNull(),
    fileName: text('file_name').notNull(),
    sheetName: text('sheet_name').notNull(),
    lineCount: integer('line_count').notNull(),
    diff: jsonb('diff').$type<LineListDiff>().notNull(),
    createdBy: text('created_by').references(() => users.id, { onDelete: 'set null' }),
    /** The uploaded file this revision was imported from, as uploaded (lib/storage/documents.ts): object key, SHA-256 and size; null before documents were kept. */
    originalKey: text('original_key'),
    originalSha256: text('original_sha256'),
    originalBytes: integer('original_bytes'),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [uniqueIndex('line_list_revisions_number_key').on(t.projectId, t.number)],
);

export const lines = pgTable(
  'lines',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    projectId: uuid('project_id')
      .notNull()
      .references(() => projects.id, { onDelete: 'cascade' }),
    tag: text('tag').notNull(),
    /** The tag with each run of digits zero-padded (migration 0015's natural_sort_key): 1", 1-½", 2", 10" sort in that order. */
    tagKey: text('tag_key').generatedAlwaysAs(sql`natural_sort_key(tag)`),
    service: text('service').notNull().default(''),
    area: text('area').notNull().default(''),
    geometry: geometryEnum('geometry').notNull(),
    nps: text('nps'),
    outsideDiameterMm: doublePrecision('outside_diameter_mm'),
    lengthM: doublePrecision('length_m'),
    surfaceAreaM2: doublePrecision('surface_area_m2'),
    heightM: doublePrecision('height_m'),
    normalTempC: doublePrecision('normal_temp_c').notNull(),
    maxTempC: doublePrecision('max_temp_c'),
    steamPressureBarG: doublePrecision('steam_pressure_bar_g'),
    flowKgPerS: doublePrecision('flow_kg_per_s'),
    fluidCpKJPerKgK: doublePrecision('fluid_cp_kj_per_kg_k'),
    elbows: integer('elbows').notNull().default(0),
    tees: integer('tees').notNull().default(0),
    valves: integer('valves').notNull().default(0),
    flanges: integer('flanges').notNull().default(0),
    purposes: text('purposes').array().notNull(),
    outdoor: boolean('outdoor').notNull().default(true),
    accessible: boolean('accessible').notNull().default(true),
    accessHeightM: doublePrecision('access_height_m'),
    jacketId: text('jacket_id'),
    /** Marked heat-traced in the line list (lib/lines/tracing.ts decides which lines are traced). */
    heatTraced: boolean('heat_traced').notNull().default(false),
    notes: text('notes').notNull().default(''),
    /** Bumped when a thermal input changes. */
    inputVersion: integer('input_version').notNull().default(1),
    /**
     * The version of a design that was taken back (undoing a bulk accept removes a decision): the next
     * decision continues from it, so a design version someone has seen is never given out again.
     */
    lastDesignVersion: integer('last_design_version').notNull().default(0),
    revision: integer('revision').notNull(),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    uniqueIndex('lines_project_tag_key').on(t.projectId, t.tag),
    index('lines_project_area_idx').on(t.projectId, t.area),
    index('lines_project_tag_sort_idx').on(t.projectId, sql`${t.tagKey} collate "C"`),
  ],
);

/** The engine's answer for a line, with what it was computed from (for stale marking). */
export const lineResults = pgTable(
  'line_results',
  {
    lineId: uuid('line_id')
      .primaryKey()
      .references(() => lines.id, { onDelete: 'cascade' }),
    projectId: uuid('project_id')
      .notNull()
      .references(() => projects.id, { onDelete: 'cascade' }),
    calcVersion: text('calc_version').notNull(),
    basisRevision: integer('basis_revision').notNull(),
    inputVersion: integer('input_version').notNull(),
    inputHash: text('input_hash').notNull(),
    recommendedMm: doublePrecision('recommended_mm'),
    governing: text('governing'),
    layers: json('layers').$type<StoredLayer[]>().notNull(),
    systemLabel: text('system_label').notNull(),
    jacketId: text('jacket_id').notNull(),
    outcomes: json('outcomes').$type<StoredOutcome[]>().notNull(),
    // json, not jsonb, for the result's documents: PostgreSQL keeps the text as sent instead of turning
    // every number into a numeric, which was most of the database's time when a solve writes 10,000
    // results (measured: 1,000 rows in ~0.25 s instead of ~1 s). Nothing queries inside them except the
    // table's shown candidate (CANDIDATE_AT_MM_SQL). Stored with lz4 (migration 0023).
    candidates: json('candidates').$type<CandidateRow[]>().notNull(),
    unmet: text('unmet').array().notNull(),
    warnings: json('warnings').$type<string[]>().notNull(),
    design: json('design').$type<StoredDesign>(),
    heatFlowPerUnit: doublePrecision('heat_flow_per_unit'),
    totalHeatW: doublePrecision('total_heat_w'),
    bareHeatW: doublePrecision('bare_heat_w').notNull(),
    surfaceTempC: doublePrecision('surface_temp_c'),
    personnelSurfaceC: doublePrecision('personnel_surface_c'),
    annualMWh: doublePrecision('annual_mwh'),
    annualCost: doublePrecision('annual_cost'),
    co2Tonnes: doublePrecision('co2_tonnes'),
    condensateKgPerH: doublePrecision('condensate_kg_per_h'),
    /** Heat tracing (lib/lines/tracing.ts): the conditions and the heat loss per metre at each candidate; null when not traced. */
    tracing: json('tracing').$type<StoredTracing>(),
    solvedAt: timestamp('solved_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index('line_results_project_idx').on(t.projectId)],
);

export const designSourceEnum = pgEnum('design_source', ['recommended', 'manual']);

/** The chosen design per line; `version` guards against two people saving over each other. */
export const lineDesigns = pgTable(
  'line_designs',
  {
    lineId: uuid('line_id')
      .primaryKey()
      .references(() => lines.id, { onDelete: 'cascade' }),
    projectId: uuid('project_id')
      .notNull()
      .references(() => projects.id, { onDelete: 'cascade' }),
    thicknessMm: doublePrecision('thickness_mm').notNull(),
    layers: jsonb('layers').$type<StoredLayer[]>().notNull(),
    source: designSourceEnum('source').notNull(),
    reason: text('reason'),
    /** A manual pick below a hard criterion: allowed with a reason, and stays flagged. */
    belowCriterion: text('below_criterion'),
    /**
     * Vessels picked part by part (shell, top and bottom head, each its own thickness or a guarded
     * head); null: the whole vessel at `thicknessMm`. `thicknessMm` then holds the shell's.
     */
    parts: jsonb('parts').$type<DesignParts>(),
    needsRedecision: boolean('needs_redecision').notNull().default(false),
    redecisionReason: text('redecision_reason'),
    decidedBy: text('decided_by').references(() => users.id, { onDelete: 'set null' }),
    decidedAt: timestamp('decided_at', { withTimezone: true }).notNull().defaultNow(),
    version: integer('version').notNull().default(1),
  },
  (t) => [index('line_designs_project_idx').on(t.projectId)],
);

/** A line's design as it was before a bulk accept replaced it (null in `before`: no decision). */
export interface DesignSnapshot {
  thicknessMm: number;
  layers: StoredLayer[];
  source: 'recommended' | 'manual';
  reason: string | null;
  belowCriterion: string | null;
  /** A vessel picked part by part (absent in snapshots taken before parts existed). */
  parts?: DesignParts | null;
  needsRedecision: boolean;
  redecisionReason: string | null;
  decidedBy: string | null;
  decidedAt: string;
  version: number;
}
export interface BulkAcceptEntry {
  lineId: string;
  tag: string;
  before: DesignSnapshot | null;
  version: number;
}

/** One "accept recommendation for the filtered lines": what it changed and what was there before, for undo. */
export const bulkAccepts = pgTable(
  'bulk_accepts',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    projectId: uuid('project_id')
      .notNull()
      .references(() => projects.id, { onDelete: 'cascade' }),
    acceptedBy: text('accepted_by').references(() => users.id, { onDelete: 'set null' }),
    acceptedAt: timestamp('accepted_at', { withTimezone: true }).notNull().defaultNow(),
    /** The table filter it was applied to: { q?, area?, status? }. */
    filter: jsonb('filter').$type<{ q?: string; area?: string; status?: string }>().notNull(),
    /** Each changed line with its design before and the design version the accept wrote. */
    entries: jsonb('entries').$type<BulkAcceptEntry[]>().notNull(),
    undoneBy: text('undone_by').references(() => users.id, { onDelete: 'set null' }),
    undoneAt: timestamp('undone_at', { withTimezone: true }),
  },
  (t) => [index('bulk_accepts_project_idx').on(t.projectId, t.acceptedAt)],
);

export const roundStatusEnum = pgEnum('review_round_status', ['open', 'signed-off']);
export const dispositionEnum = pgEnum('review_disposition', [
  'insulate',
  'guard',
  'warning-sign',
  'not-accessible',
  'returned',
  'vapour-retarder-repair',
  'drip-protection',
]);

/** A set of flagged lines an engineer asks the safety reviewer to decide on. */
export const reviewRounds = pgTable(
  'review_rounds',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    projectId: uuid('project_id')
      .notNull()
      .references(() => projects.id, { onDelete: 'cascade' }),
    number: integer('number').notNull(),
    status: roundStatusEnum('status').notNull().default('open'),
    note: text('note').notNull().default(''),
    requestedBy: text('requested_by')
      .notNull()
      .references(() => users.id),
    requestedAt: timestamp('requested_at', { withTimezone: true }).notNull().defaultNow(),
    calcVersion: text('calc_version').notNull(),
    basisRevision: integer('basis_revision').notNull(),
    signedOffBy: text('signed_off_by').references(() => users.id),
    signedOffAt: timestamp('signed_off_at', { withTimezone: true }),
    /** Flagged values and dispositions as signed, kept as they were. */
    snapshot: jsonb('snapshot').$type<ReviewSnapshot>(),
  },
  (t) => [uniqueIndex('review_rounds_number_key').on(t.projectId, t.number)],
);

export const reviewItems = pgTable(
  'review_items',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    roundId: uuid('round_id')
      .notNull()
      .references(() => reviewRounds.id, { onDelete: 'cascade' }),
    projectId: uuid('project_id')
      .notNull()
      .references(() => projects.id, { onDelete: 'cascade' }),
    /** Lines can leave the list in a later revision; the item keeps its tag. */
    lineId: uuid('line_id').references(() => lines.id, { onDelete: 'set null' }),
    tag: text('tag').notNull(),
    area: text('area').notNull(),
    flags: jsonb('flags').$type<Flag[]>().notNull(),
    lineInputVersion: integer('line_input_version').notNull(),
    designVersion: integer('design_version').notNull(),
    disposition: dispositionEnum('disposition'),
    requiredMm: doublePrecision('required_mm'),
    comment: text('comment'),
    decidedBy: text('decided_by').references(() => users.id),
    decidedAt: timestamp('decided_at', { withTimezone: true }),
    /** The signed-off round this decision was carried over from (the line's inputs, design and flags unchanged since). */
    carriedFromRound: integer('carried_from_round'),
  },
  (t) => [index('review_items_round_idx').on(t.roundId), index('review_items_line_idx').on(t.lineId)],
);

/**
 * Append-only record of dispositions, sign-offs and design picks. A trigger (migration 0002)
 * refuses UPDATE and DELETE, so the record holds whatever the application does.
 */
export const auditLog = pgTable(
  'audit_log',
  {
    id: integer('id').primaryKey().generatedAlwaysAsIdentity(),
    projectId: uuid('project_id').notNull(),
    lineId: uuid('line_id'),
    tag: text('tag'),
    actorId: text('actor_id'),
    actorName: text('actor_name').notNull(),
    at: timestamp('at', { withTimezone: true }).notNull().defaultNow(),
    action: text('action').notNull(),
    before: jsonb('before').$type<unknown>(),
    after: jsonb('after').$type<unknown>(),
  },
  (t) => [index('audit_log_project_idx').on(t.projectId, t.at), index('audit_log_line_idx').on(t.lineId)],
);

/**
 * Comments on a line, threaded one level: a reply names the comment that opened its thread
 * (lib/comments/store.ts). Plain text; the author's name is kept as it was when they wrote.
 */
export const lineComments = pgTable(
  'line_comments',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    projectId: uuid('project_id')
      .notNull()
      .references(() => projects.id, { onDelete: 'cascade' }),
    lineId: uuid('line_id')
      .notNull()
      .references(() => lines.id, { onDelete: 'cascade' }),
    parentId: uuid('parent_id').references((): AnyPgColumn => lineComments.id, { onDelete: 'cascade' }),
    authorId: text('author_id').references(() => users.id, { onDelete: 'set null' }),
    authorName: text('author_name').notNull(),
    body: text('body').notNull(),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index('line_comments_line_idx').on(t.lineId, t.createdAt)],
);
export type LineComment = typeof lineComments.$inferSelect;

/** Issued revisions of the bill of quantities, each with the quantities as issued. */
export const boqIssues = pgTable(
  'boq_issues',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    projectId: uuid('project_id')
      .notNull()
      .references(() => projects.id, { onDelete: 'cascade' }),
    number: integer('number').notNull(),
    issuedBy: text('issued_by')
      .notNull()
      .references(() => users.id),
    issuedAt: timestamp('issued_at', { withTimezone: true }).notNull().defaultNow(),
    basisRevision: integer('basis_revision').notNull(),
    lineListRevision: integer('line_list_revision'),
    quantities: jsonb('quantities').$type<BillQuantities>().notNull(),
    counted: integer('counted').notNull(),
    pending: integer('pending').notNull(),
    /** The workbook as issued (lib/storage/documents.ts): object key, SHA-256 and size; null before documents were kept. */
    documentKey: text('document_key'),
    documentSha256: text('document_sha256'),
    documentBytes: integer('document_bytes'),
  },
  (t) => [uniqueIndex('boq_issues_number_key').on(t.projectId, t.number)],
);

/**
 * The project's own bill factors (accessory spacings, laps, coverages), each with its source; what a
 * project leaves out comes from the defaults in lib/boq/quantities.ts. Changing them changes the next
 * issue only — issued bills keep the factors they were issued with.
 */
export const billFactors = pgTable('bill_factors', {
  projectId: uuid('project_id')
    .primaryKey()
    .references(() => projects.id, { onDelete: 'cascade' }),
  factors: jsonb('factors').$type<Record<string, { value: number; source: string }>>().notNull(),
  updatedBy: text('updated_by').references(() => users.id, { onDelete: 'set null' }),
  updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
});

/** The PDF a calculation-sheet batch job produced, kept for download. */
export const sheetBatches = pgTable('sheet_batches', {
  jobId: uuid('job_id')
    .primaryKey()
    .references(() => jobs.id, { onDelete: 'cascade' }),
  projectId: uuid('project_id')
    .notNull()
    .references(() => projects.id, { onDelete: 'cascade' }),
  fileName: text('file_name').notNull(),
  lineCount: integer('line_count').notNull(),
  /** The zip of per-line PDFs in the object store (lib/storage/documents.ts): key, SHA-256, size. */
  documentKey: text('document_key'),
  documentSha256: text('document_sha256'),
  documentBytes: integer('document_bytes'),
  /** Legacy: batches made before documents moved to the object store kept their PDF here (still served). */
  pdf: bytea('pdf'),
  createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
});

/**
 * Issued revisions of the project design report, numbered per project like the bill; the PDF is
 * kept byte for byte as issued (append-only: the application may only read and add).
 */
export const designReports = pgTable(
  'design_reports',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    projectId: uuid('project_id')
      .notNull()
      .references(() => projects.id, { onDelete: 'cascade' }),
    number: integer('number').notNull(),
    issuedBy: text('issued_by')
      .notNull()
      .references(() => users.id),
    issuedAt: timestamp('issued_at', { withTimezone: true }).notNull().defaultNow(),
    basisRevision: integer('basis_revision').notNull(),
    lineListRevision: integer('line_list_revision'),
    calcVersion: text('calc_version').notNull(),
    note: text('note').notNull().default(''),
    /** The figures the report states (totals, counts), for the revision list and checks. */
    summary: jsonb('summary').notNull(),
    /** SHA-256 of the PDF as issued; the bytes are in the object store under `documentKey`. */
    sha256: text('sha256').notNull(),
    documentKey: text('document_key'),
    documentBytes: integer('document_bytes'),
    /** Legacy: revisions issued before documents moved to the object store (moved by `npm run documents:move`). */
    pdf: bytea('pdf'),
  },
  (t) => [uniqueIndex('design_reports_number_key').on(t.projectId, t.number)],
);

/** The plant's heat-loss budget and its allocation by area. */
export const budgets = pgTable('budgets', {
  projectId: uuid('project_id')
    .primaryKey()
    .references(() => projects.id, { onDelete: 'cascade' }),
  totalKW: doublePrecision('total_kw').notNull(),
  totalMWhPerYear: doublePrecision('total_mwh_per_year').notNull(),
  allocations: jsonb('allocations').$type<{ area: string; kW: number }[]>().notNull(),
  updatedBy: text('updated_by').references(() => users.id),
  updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
});

/** Company sign-in (OpenID Connect) of an organization; the client secret is stored encrypted. */
export const ssoConfigs = pgTable('sso_configs', {
  organizationId: uuid('organization_id')
    .primaryKey()
    .references(() => organizations.id, { onDelete: 'cascade' }),
  issuer: text('issuer').notNull(),
  clientId: text('client_id').notNull(),
  clientSecretEnc: text('client_secret_enc').notNull(),
  /** Role given to people who arrive this way; null = they wait for an owner's approval. */
  newMemberRole: roleEnum('new_member_role'),
  passwordsAllowed: boolean('passwords_allowed').notNull().default(true),
  updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
});

/**
 * E-mail domains an organization's company sign-in claims. A claim takes effect only once proven
 * (verifiedAt set by the one-time link mailed to an administrative address of the domain); a domain
 * has at most one verified owner, while unproven claims of several organizations may wait side by side.
 */
export const ssoDomains = pgTable(
  'sso_domains',
  {
    domain: text('domain').notNull(),
    organizationId: uuid('organization_id')
      .notNull()
      .references(() => organizations.id, { onDelete: 'cascade' }),
    verifiedAt: timestamp('verified_at', { withTimezone: true }),
    verifiedVia: text('verified_via'),
  },
  (t) => [
    primaryKey({ columns: [t.organizationId, t.domain] }),
    uniqueIndex('sso_domains_verified_owner_key').on(t.domain).where(sql`${t.verifiedAt} is not null`),
  ],
);

/** One-time domain-proof links, mailed to an administrative address of the domain; only the hash is kept. */
export const domainVerifications = pgTable(
  'domain_verifications',
  {
    tokenHash: text('token_hash').primaryKey(),
    organizationId: uuid('organization_id')
      .notNull()
      .references(() => organizations.id, { onDelete: 'cascade' }),
    domain: text('domain').notNull(),
    sentTo: text('sent_to').notNull(),
    requestedBy: text('requested_by').references(() => users.id, { onDelete: 'set null' }),
    expiresAt: timestamp('expires_at', { withTimezone: true }).notNull(),
    usedAt: timestamp('used_at', { withTimezone: true }),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index('domain_verifications_org_idx').on(t.organizationId, t.domain)],
);

/** A removal or a refused request: company sign-in does not bring the person back until an owner re-admits them. */
export const membershipBlocks = pgTable(
  'membership_blocks',
  {
    organizationId: uuid('organization_id')
      .notNull()
      .references(() => organizations.id, { onDelete: 'cascade' }),
    userId: text('user_id')
      .notNull()
      .references(() => users.id, { onDelete: 'cascade' }),
    reason: text('reason', { enum: ['removed', 'refused'] }).notNull(),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [primaryKey({ columns: [t.organizationId, t.userId] })],
);

export const userIdentities = pgTable(
  'user_identities',
  {
    issuer: text('issuer').notNull(),
    subject: text('subject').notNull(),
    userId: text('user_id')
      .notNull()
      .references(() => users.id, { onDelete: 'cascade' }),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [primaryKey({ columns: [t.issuer, t.subject] })],
);

/** People who signed in with the company account and wait for an owner to give them a role. */
export const membershipRequests = pgTable(
  'membership_requests',
  {
    organizationId: uuid('organization_id')
      .notNull()
      .references(() => organizations.id, { onDelete: 'cascade' }),
    userId: text('user_id')
      .notNull()
      .references(() => users.id, { onDelete: 'cascade' }),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [primaryKey({ columns: [t.organizationId, t.userId] })],
);

/**
 * A company identity waiting to be linked to an existing account. `tokenHash` is the hash of the secret
 * kept only in the httpOnly cookie of the browser that came back from the provider; `mailTokenHash` the
 * hash of the one-time link mailed to the account's address. Mail linking needs both (the link opened in
 * that same browser); password linking needs the cookie and the account's password.
 */
export const pendingLinks = pgTable('pending_links', {
  tokenHash: text('token_hash').primaryKey(),
  issuer: text('issuer').notNull(),
  subject: text('subject').notNull(),
  email: text('email').notNull(),
  userId: text('user_id').references(() => users.id, { onDelete: 'cascade' }),
  mailTokenHash: text('mail_token_hash').unique(),
  organizationId: uuid('organization_id')
    .notNull()
    .references(() => organizations.id, { onDelete: 'cascade' }),
  expiresAt: timestamp('expires_at', { withTimezone: true }).notNull(),
});

/**
 * Personal access tokens for scripts. Each belongs to one person in one organization; its scopes
 * were allowed by that person's role when it was made and are checked against the current role at
 * every use. Only the SHA-256 of the token is kept (lib/auth/api-tokens.ts says why that is enough).
 */
export const apiTokens = pgTable(
  'api_tokens',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    userId: text('user_id')
      .notNull()
      .references(() => users.id, { onDelete: 'cascade' }),
    organizationId: uuid('organization_id')
      .notNull()
      .references(() => organizations.id, { onDelete: 'cascade' }),
    name: text('name').notNull(),
    /** The first characters of the token, shown in lists so a person can tell their tokens apart. */
    prefix: text('prefix').notNull(),
    tokenHash: text('token_hash').notNull().unique(),
    scopes: text('scopes').array().notNull(),
    expiresAt: timestamp('expires_at', { withTimezone: true }).notNull(),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
    lastUsedAt: timestamp('last_used_at', { withTimezone: true }),
    revokedAt: timestamp('revoked_at', { withTimezone: true }),
    revokedBy: text('revoked_by').references(() => users.id, { onDelete: 'set null' }),
  },
  (t) => [index('api_tokens_user_idx').on(t.userId), index('api_tokens_org_idx').on(t.organizationId)],
);

/**
 * Append-only record of every token event: made, revoked, used (with the answer's status) and
 * refused (expired, revoked, missing scope). The application may only read and insert (db/migrate.ts).
 */
export const apiTokenEvents = pgTable(
  'api_token_events',
  {
    id: integer('id').primaryKey().generatedAlwaysAsIdentity(),
    tokenId: uuid('token_id').notNull(),
    organizationId: uuid('organization_id').notNull(),
    userId: text('user_id'),
    actorName: text('actor_name').notNull(),
    at: timestamp('at', { withTimezone: true }).notNull().defaultNow(),
    action: text('action', { enum: ['created', 'revoked', 'used', 'refused'] }).notNull(),
    method: text('method'),
    path: text('path'),
    status: integer('status'),
    detail: jsonb('detail').$type<Record<string, unknown>>(),
  },
  (t) => [
    index('api_token_events_token_idx').on(t.tokenId, t.at),
    index('api_token_events_org_idx').on(t.organizationId, t.at),
  ],
);

export const usersRelations = relations(users, ({ many }) => ({ memberships: many(memberships) }));
export const organizationsRelations = relations(organizations, ({ many }) => ({
  memberships: many(memberships),
  projects: many(projects),
}));
export const membershipsRelations = relations(memberships, ({ one }) => ({
  organization: one(organizations, { fields: [memberships.organizationId], references: [organizations.id] }),
  user: one(users, { fields: [memberships.userId], references: [users.id] }),
}));
export const projectsRelations = relations(projects, ({ one }) => ({
  organization: one(organizations, { fields: [projects.organizationId], references: [organizations.id] }),
}));

export type User = typeof users.$inferSelect;
export type Organization = typeof organizations.$inferSelect;
export type Membership = typeof memberships.$inferSelect;
export type Project = typeof projects.$inferSelect;
export type NewProject = typeof projects.$inferInsert;
export type Invitation = typeof invitations.$inferSelect;
export type Line = typeof lines.$inferSelect;
export type LineResult = typeof lineResults.$inferSelect;
export type LineDesign = typeof lineDesigns.$inferSelect;
export type ApiToken = typeof apiTokens.$inferSelect;

export const jobKindEnum = pgEnum('job_kind', [
  'import-solve',
  'solve-all',
  'issue-bill',
  'sheets-batch',
  'read-upload',
  'check-import',
  'what-if',
]);
export const jobStateEnum = pgEnum('job_state', ['queued', 'running', 'done', 'failed']);

/**
 * One row per background job, what the user sees (the queue itself is pg-boss's, in schema pgboss).
 * `error` is a sentence for the user, never a stack or input values.
 */
export const jobs = pgTable(
  'jobs',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    projectId: uuid('project_id')
      .notNull()
      .references(() => projects.id, { onDelete: 'cascade' }),
    kind: jobKindEnum('kind').notNull(),
    createdBy: text('created_by').references(() => users.id, { onDelete: 'set null' }),
    state: jobStateEnum('state').notNull().default('queued'),
    /** Lines solved so far and lines to solve (0 until known). */
    done: integer('done').notNull().default(0),
    total: integer('total').notNull().default(0),
    attempts: integer('attempts').notNull().default(0),
    input: jsonb('input').$type<Record<string, unknown>>().notNull(),
    result: jsonb('result').$type<Record<string, unknown>>(),
    error: text('error'),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
    startedAt: timestamp('started_at', { withTimezone: true }),
    finishedAt: timestamp('finished_at', { withTimezone: true }),
  },
  (t) => [index('jobs_project_idx').on(t.projectId, t.createdAt)],
);
export type Job = typeof jobs.$inferSelect;

/**
 * A person's own settings of the screens, one row per user, kept on the server so they follow the person
 * to another browser. One typed column per screen; read through its pure module (tolerant of old values).
 */
export const userPreferences = pgTable('user_preferences', {
  userId: text('user_id')
    .primaryKey()
    .references(() => users.id, { onDelete: 'cascade' }),
  /** The line table's hidden columns and row density (`lib/preferences/line-table-view.ts`). */
  lineTable: jsonb('line_table').$type<LineTableView>(),
  updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
});
