/**
 * Twofold's tables. TypeScript names camelCase, SQL names snake_case. Every team-owned row
 * carries `team_id` and every query filters by the caller's team. Row types are inferred
 * (`$inferSelect` / `$inferInsert`), never written by hand.
 */
import {
	bigserial,
	boolean,
	customType,
	doublePrecision,
	index,
	integer,
	jsonb,
	pgEnum,
	pgTable,
	primaryKey,
	text,
	timestamp,
	uniqueIndex,
	uuid
} from 'drizzle-orm/pg-core';
import type { AnyPgColumn } from 'drizzle-orm/pg-core';
import type { CaseDocument } from '../../../../solver/case.js';
import type { StudyPoint } from '../../studies/types.js';

const bytea = customType<{ data: Buffer; driverData: Buffer }>({
	dataType() {
		return 'bytea';
	}
});

const createdAt = () => timestamp('created_at', { withTimezone: true, mode: 'date' }).notNull().defaultNow();

export const roleEnum = pgEnum('role', ['viewer', 'analyst', 'lead', 'admin']);
export type Role = (typeof roleEnum.enumValues)[number];

// ---------------------------------------------------------------- people and teams (Auth.js shape)

/** Auth.js user table (adapter columns: id, name, email, emailVerified, image) plus our password hash. */
export const users = pgTable('users', {
	id: text('id')
		.primaryKey()
		.$defaultFn(() => crypto.randomUUID()),
	name: text('name'),
	email: text('email').notNull().unique(),
	emailVerified: timestamp('email_verified', { withTimezone: true, mode: 'date' }),
	image: text('image'),
	/** argon2id hash; null for accounts that only sign in by e-mail link */
	passwordHash: text('password_hash'),
	createdAt: createdAt()
});

export const accounts = pgTable(
	'accounts',
	{
		userId: text('user_id')
			.notNull()
			.references(() => users.id, { onDelete: 'cascade' }),
		type: text('type').$type<'email' | 'oauth' | 'oidc' | 'webauthn'>().notNull(),
		provider: text('provider').notNull(),
		providerAccountId: text('provider_account_id').notNull(),
		refresh_token: text('refresh_token'),
		access_token: text('access_token'),
		expires_at: integer('expires_at'),
		token_type: text('token_type'),
		scope: text('scope'),
		id_token: text('id_token'),
		session_state: text('session_state')
	},
	(t) => [primaryKey({ columns: [t.provider, t.providerAccountId] })]
);

export const sessions = pgTable('sessions', {
	sessionToken: text('session_token').primaryKey(),
	userId: text('user_id')
		.notNull()
		.references(() => users.id, { onDelete: 'cascade' }),
	expires: timestamp('expires', { withTimezone: true, mode: 'date' }).notNull()
});

export const verificationTokens = pgTable(
	'verification_tokens',
	{
		identifier: text('identifier').notNull(),
		token: text('token').notNull(),
		expires: timestamp('expires', { withTimezone: true, mode: 'date' }).notNull()
	},
	(t) => [primaryKey({ columns: [t.identifier, t.token] })]
);

/** Failed password sign-ins per e-mail address, to slow down guessing. */
export const signInThrottle = pgTable('sign_in_throttle', {
	key: text('key').primaryKey(),
	failures: integer('failures').notNull().default(0),
	windowStartedAt: timestamp('window_started_at', { withTimezone: true, mode: 'date' }).notNull().defaultNow(),
	lockedUntil: timestamp('locked_until', { withTimezone: true, mode: 'date' })
});

export const teams = pgTable('teams', {
	id: uuid('id').primaryKey().defaultRandom(),
	name: text('name').notNull(),
	slug: text('slug').notNull().unique(),
	/** how many runs of this team may wait in the queue or run at once */
	maxActiveRuns: integer('max_active_runs').notNull().default(8),
	/** how many member runs one study may queue (its admin sets it); study members do not count against max_active_runs */
	maxStudyRuns: integer('max_study_runs').notNull().default(100),
	createdAt: createdAt()
});

export const memberships = pgTable(
	'memberships',
	{
		teamId: uuid('team_id')
			.notNull()
			.references(() => teams.id, { onDelete: 'cascade' }),
		userId: text('user_id')
			.notNull()
			.references(() => users.id, { onDelete: 'cascade' }),
		role: roleEnum('role').notNull(),
		/** no e-mail when a run this member queued ends */
		muteRunMail: boolean('mute_run_mail').notNull().default(false),
		createdAt: createdAt()
	},
	(t) => [primaryKey({ columns: [t.teamId, t.userId] }), index('memberships_user_idx').on(t.userId)]
);

export const invitations = pgTable(
	'invitations',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		teamId: uuid('team_id')
			.notNull()
			.references(() => teams.id, { onDelete: 'cascade' }),
		email: text('email').notNull(),
		role: roleEnum('role').notNull(),
		/** SHA-256 of the token sent by e-mail; the token itself is never stored */
		tokenHash: text('token_hash').notNull().unique(),
		invitedBy: text('invited_by').references(() => users.id, { onDelete: 'set null' }),
		createdAt: createdAt(),
		expiresAt: timestamp('expires_at', { withTimezone: true, mode: 'date' }).notNull(),
		acceptedAt: timestamp('accepted_at', { withTimezone: true, mode: 'date' })
	},
	(t) => [index('invitations_team_idx').on(t.teamId)]
);

/** What the local fake SMTP server received (local installs and tests only). */
export const outgoingMail = pgTable(
	'outgoing_mail',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		messageId: text('message_id'),
		fromAddress: text('from_address').notNull(),
		toAddresses: text('to_addresses').notNull(),
		subject: text('subject').notNull().default(''),
		text: text('text'),
		html: text('html'),
		raw: text('raw').notNull(),
		receivedAt: timestamp('received_at', { withTimezone: true, mode: 'date' }).notNull().defaultNow()
	},
	(t) => [index('outgoing_mail_received_idx').on(t.receivedAt)]
);

export const apiTokenScopeEnum = pgEnum('api_token_scope', ['read', 'role']);

/**
 * Personal API tokens. The token itself is shown once; only its SHA-256 is stored (a random
 * 256-bit secret needs no slow hash, and the digest is what a request is looked up by).
 * `scope` read = viewer rights whatever the member's role; role = exactly the member's role.
 */
export const apiTokens = pgTable(
	'api_tokens',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		teamId: uuid('team_id')
			.notNull()
			.references(() => teams.id, { onDelete: 'cascade' }),
		userId: text('user_id')
			.notNull()
			.references(() => users.id, { onDelete: 'cascade' }),
		name: text('name').notNull(),
		/** the first characters of the token, to tell tokens apart in lists */
		prefix: text('prefix').notNull(),
		tokenHash: text('token_hash').notNull().unique(),
		scope: apiTokenScopeEnum('scope').notNull().default('read'),
		expiresAt: timestamp('expires_at', { withTimezone: true, mode: 'date' }),
		lastUsedAt: timestamp('last_used_at', { withTimezone: true, mode: 'date' }),
		revokedAt: timestamp('revoked_at', { withTimezone: true, mode: 'date' }),
		createdAt: createdAt()
	},
	(t) => [index('api_tokens_team_user_idx').on(t.teamId, t.userId)]
);

export const auditLog = pgTable(
	'audit_log',
	{
		id: bigserial('id', { mode: 'number' }).primaryKey(),
		teamId: uuid('team_id').references(() => teams.id, { onDelete: 'cascade' }),
		userId: text('user_id').references(() => users.id, { onDelete: 'set null' }),
		action: text('action').notNull(),
		subject: text('subject'),
		detail: jsonb('detail').$type<Record<string, unknown>>(),
		at: timestamp('at', { withTimezone: true, mode: 'date' }).notNull().defaultNow()
	},
	(t) => [index('audit_log_team_idx').on(t.teamId, t.at)]
);

// ---------------------------------------------------------------- equipment

/** One equipment item under study (a tag such as C-201). */
export const columns = pgTable(
	'columns',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		teamId: uuid('team_id')
			.notNull()
			.references(() => teams.id, { onDelete: 'cascade' }),
		tag: text('tag').notNull(),
		service: text('service').notNull().default(''),
		/** inner diameter, m */
		diameterM: doublePrecision('diameter_m').notNull(),
		/** tangent-to-tangent height, m */
		heightM: doublePrecision('height_m').notNull(),
		notes: text('notes').notNull().default(''),
		createdBy: text('created_by').references(() => users.id, { onDelete: 'set null' }),
		createdAt: createdAt(),
		updatedAt: timestamp('updated_at', { withTimezone: true, mode: 'date' }).notNull().defaultNow()
	},
	(t) => [uniqueIndex('columns_team_tag_uq').on(t.teamId, t.tag)]
);

// ---------------------------------------------------------------- cases and runs

export const runStatusEnum = pgEnum('run_status', ['queued', 'running', 'converged', 'finished', 'failed', 'cancelled']);
export type RunStatusValue = (typeof runStatusEnum.enumValues)[number];

/** One complete setup of a column; the document is the solver's zod case (with its schemaVersion). */
export const cases = pgTable(
	'cases',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		teamId: uuid('team_id')
			.notNull()
			.references(() => teams.id, { onDelete: 'cascade' }),
		columnId: uuid('column_id')
			.notNull()
			.references(() => columns.id, { onDelete: 'cascade' }),
		name: text('name').notNull(),
		kind: text('kind').$type<CaseDocument['kind']>().notNull(),
		schemaVersion: integer('schema_version').notNull(),
		document: jsonb('document').$type<CaseDocument>().notNull(),
		createdBy: text('created_by').references(() => users.id, { onDelete: 'set null' }),
		createdAt: createdAt(),
		updatedAt: timestamp('updated_at', { withTimezone: true, mode: 'date' }).notNull().defaultNow()
	},
	(t) => [index('cases_column_idx').on(t.teamId, t.columnId)]
);

/** One execution of a case: a frozen copy of the case and the solver version keep it reproducible. */
export const runs = pgTable(
	'runs',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		teamId: uuid('team_id')
			.notNull()
			.references(() => teams.id, { onDelete: 'cascade' }),
		columnId: uuid('column_id')
			.notNull()
			.references(() => columns.id, { onDelete: 'cascade' }),
		caseId: uuid('case_id').references(() => cases.id, { onDelete: 'set null' }),
		caseDocument: jsonb('case_document').$type<CaseDocument>().notNull(),
		solverVersion: text('solver_version').notNull(),
		status: runStatusEnum('status').notNull().default('queued'),
		queuedBy: text('queued_by').references(() => users.id, { onDelete: 'set null' }),
		queuedAt: timestamp('queued_at', { withTimezone: true, mode: 'date' }).notNull().defaultNow(),
		startedAt: timestamp('started_at', { withTimezone: true, mode: 'date' }),
		finishedAt: timestamp('finished_at', { withTimezone: true, mode: 'date' }),
		/** pg-boss job id of the current attempt */
		jobId: text('job_id'),
		/** the worker process working it (host:pid), and when it last showed it is alive */
		workerId: text('worker_id'),
		heartbeatAt: timestamp('heartbeat_at', { withTimezone: true, mode: 'date' }),
		attempts: integer('attempts').notNull().default(0),
		cancelRequested: boolean('cancel_requested').notNull().default(false),
		steps: integer('steps').notNull().default(0),
		simulatedTimeS: doublePrecision('simulated_time_s').notNull().default(0),
		wallTimeS: doublePrecision('wall_time_s').notNull().default(0),
		summary: jsonb('summary').$type<Record<string, unknown>>(),
		errorMessage: text('error_message'),
		/** the study this run is a member of (null for a run queued on its own) */
		studyId: uuid('study_id').references((): AnyPgColumn => studies.id, { onDelete: 'set null' }),
		/** position in its study (0-based): also its queue priority, −index, so studies interleave */
		studyIndex: integer('study_index'),
		/** the member's inputs, e.g. { label: 'U_g = 0.05 m/s', values: { superficialGasVelocityMS: 0.05 } } */
		studyPoint: jsonb('study_point').$type<StudyPoint>()
	},
	(t) => [
		index('runs_team_status_idx').on(t.teamId, t.status),
		index('runs_column_idx').on(t.columnId, t.queuedAt),
		index('runs_study_idx').on(t.studyId, t.studyIndex)
	]
);

export const studyKindEnum = pgEnum('study_kind', ['sweep', 'closure-matrix', 'grid']);
export type StudyKindValue = (typeof studyKindEnum.enumValues)[number];

/**
 * One question asked of many runs: a sweep of inputs, a closure matrix or a grid study. Its
 * members are ordinary runs (`runs.study_id`); its state is derived from theirs.
 */
export const studies = pgTable(
	'studies',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		teamId: uuid('team_id')
			.notNull()
			.references(() => teams.id, { onDelete: 'cascade' }),
		columnId: uuid('column_id')
			.notNull()
			.references(() => columns.id, { onDelete: 'cascade' }),
		caseId: uuid('case_id').references(() => cases.id, { onDelete: 'set null' }),
		name: text('name').notNull(),
		kind: studyKindEnum('kind').notNull(),
		/** the kind's settings (src/lib/studies/spec.ts), validated */
		spec: jsonb('spec').$type<Record<string, unknown>>().notNull(),
		/** the case every member starts from, frozen when the study was created */
		baseCase: jsonb('base_case').$type<CaseDocument>().notNull(),
		memberCount: integer('member_count').notNull(),
		/** measurement the members are ranked against / drawn with */
		measurementId: uuid('measurement_id').references(() => measurements.id, { onDelete: 'set null' }),
		createdBy: text('created_by').references(() => users.id, { onDelete: 'set null' }),
		createdAt: createdAt(),
		cancelledAt: timestamp('cancelled_at', { withTimezone: true, mode: 'date' })
	},
	(t) => [index('studies_column_idx').on(t.teamId, t.columnId, t.createdAt)]
);

/**
 * Worker processes, on any machine, sharing the database. Each registers at start and refreshes
 * `heartbeat_at` every few seconds; one whose heartbeat is old and that did not say it stopped is lost.
 */
export const workers = pgTable('workers', {
	/** host:pid:random, as stored on the runs it claims */
	id: text('id').primaryKey(),
	host: text('host').notNull(),
	pid: integer('pid').notNull(),
	slots: integer('slots').notNull(),
	solverVersion: text('solver_version').notNull(),
	startedAt: timestamp('started_at', { withTimezone: true, mode: 'date' }).notNull().defaultNow(),
	heartbeatAt: timestamp('heartbeat_at', { withTimezone: true, mode: 'date' }).notNull().defaultNow(),
	stoppedAt: timestamp('stopped_at', { withTimezone: true, mode: 'date' }),
	activeRuns: integer('active_runs').notNull().default(0),
	runsDone: integer('runs_done').notNull().default(0)
});

/** Append-only residual history; (run, step) is unique so a resumed run never writes a step twice. */
export const residuals = pgTable(
	'residuals',
	{
		id: bigserial('id', { mode: 'number' }).primaryKey(),
		runId: uuid('run_id')
			.notNull()
			.references(() => runs.id, { onDelete: 'cascade' }),
		step: integer('step').notNull(),
		simulatedTimeS: doublePrecision('simulated_time_s').notNull(),
		values: jsonb('values').$type<Record<string, number>>().notNull()
	},
	(t) => [uniqueIndex('residuals_run_step_uq').on(t.runId, t.step)]
);

/** Fields along the line at one instant: msgpackr-encoded typed arrays. */
export const snapshots = pgTable(
	'snapshots',
	{
		id: bigserial('id', { mode: 'number' }).primaryKey(),
		runId: uuid('run_id')
			.notNull()
			.references(() => runs.id, { onDelete: 'cascade' }),
		step: integer('step').notNull(),
		simulatedTimeS: doublePrecision('simulated_time_s').notNull(),
		isFinal: boolean('is_final').notNull().default(false),
		data: bytea('data').notNull()
	},
	(t) => [uniqueIndex('snapshots_run_step_uq').on(t.runId, t.step)]
);

/** The latest checkpoint of a run (one row per run), to resume after a crash. */
export const checkpoints = pgTable('checkpoints', {
	runId: uuid('run_id')
		.primaryKey()
		.references(() => runs.id, { onDelete: 'cascade' }),
	step: integer('step').notNull(),
	simulatedTimeS: doublePrecision('simulated_time_s').notNull(),
	data: bytea('data').notNull(),
	updatedAt: timestamp('updated_at', { withTimezone: true, mode: 'date' }).notNull().defaultNow()
});

// ---------------------------------------------------------------- measurements, comparisons, sign-off

export const measurementKindEnum = pgEnum('measurement_kind', [
	'holdup-height',
	'pressure-height',
	'holdup-radial',
	'liquid-velocity-radial',
	'dissolved-oxygen'
]);

/** Data a member uploaded, stored in SI: `data.x` (position or time) and `data.y`. */
export const measurements = pgTable(
	'measurements',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		teamId: uuid('team_id')
			.notNull()
			.references(() => teams.id, { onDelete: 'cascade' }),
		columnId: uuid('column_id')
			.notNull()
			.references(() => columns.id, { onDelete: 'cascade' }),
		kind: measurementKindEnum('kind').notNull(),
		name: text('name').notNull(),
		superficialGasVelocityMS: doublePrecision('superficial_gas_velocity_m_s').notNull(),
		temperatureK: doublePrecision('temperature_k').notNull(),
		pressurePa: doublePrecision('pressure_pa').notNull(),
		/** the units of each file column as uploaded, e.g. { x: 'mm', y: '%' } */
		units: jsonb('units').$type<Record<string, string>>().notNull(),
		sourceNote: text('source_note').notNull().default(''),
		fileName: text('file_name'),
		data: jsonb('data').$type<{ x: number[]; y: number[] }>().notNull(),
		createdBy: text('created_by').references(() => users.id, { onDelete: 'set null' }),
		createdAt: createdAt()
	},
	(t) => [index('measurements_column_idx').on(t.teamId, t.columnId)]
);

/** A saved set of 2–6 runs of one column shown side by side, one of them the baseline. */
export const comparisons = pgTable(
	'comparisons',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		teamId: uuid('team_id')
			.notNull()
			.references(() => teams.id, { onDelete: 'cascade' }),
		columnId: uuid('column_id')
			.notNull()
			.references(() => columns.id, { onDelete: 'cascade' }),
		name: text('name').notNull(),
		runIds: jsonb('run_ids').$type<string[]>().notNull(),
		baselineRunId: uuid('baseline_run_id').notNull(),
		measurementId: uuid('measurement_id').references(() => measurements.id, { onDelete: 'set null' }),
		createdBy: text('created_by').references(() => users.id, { onDelete: 'set null' }),
		createdAt: createdAt()
	},
	(t) => [index('comparisons_column_idx').on(t.teamId, t.columnId)]
);

export const subjectTypeEnum = pgEnum('subject_type', ['case', 'comparison', 'run', 'study']);
export const verdictEnum = pgEnum('verdict', ['approved-basis', 'changes-requested']);

/** The lead's verdict on a case or comparison; the newest row is the current state. */
export const signOffs = pgTable(
	'sign_offs',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		teamId: uuid('team_id')
			.notNull()
			.references(() => teams.id, { onDelete: 'cascade' }),
		subjectType: subjectTypeEnum('subject_type').notNull(),
		subjectId: uuid('subject_id').notNull(),
		verdict: verdictEnum('verdict').notNull(),
		comment: text('comment').notNull().default(''),
		signedBy: text('signed_by').references(() => users.id, { onDelete: 'set null' }),
		createdAt: createdAt()
	},
	(t) => [index('sign_offs_subject_idx').on(t.teamId, t.subjectType, t.subjectId, t.createdAt)]
);

export const comments = pgTable(
	'comments',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		teamId: uuid('team_id')
			.notNull()
			.references(() => teams.id, { onDelete: 'cascade' }),
		subjectType: subjectTypeEnum('subject_type').notNull(),
		subjectId: uuid('subject_id').notNull(),
		body: text('body').notNull(),
		authorId: text('author_id').references(() => users.id, { onDelete: 'set null' }),
		createdAt: createdAt()
	},
	(t) => [index('comments_subject_idx').on(t.teamId, t.subjectType, t.subjectId, t.createdAt)]
);

/**
 * The solver's verification cases computed by a worker, one row per solver version (recomputed
 * when the version changes). `results` is the list of cases with their errors, observed orders
 * and chart data (src/lib/server/verification); `progress` 0–1 while computing.
 */
export const verificationResults = pgTable('verification_results', {
	solverVersion: text('solver_version').primaryKey(),
	status: text('status').$type<'queued' | 'computing' | 'done' | 'failed'>().notNull().default('queued'),
	progress: doublePrecision('progress').notNull().default(0),
	results: jsonb('results').$type<unknown[]>(),
	errorMessage: text('error_message'),
	workerId: text('worker_id'),
	queuedAt: timestamp('queued_at', { withTimezone: true, mode: 'date' }).notNull().defaultNow(),
	startedAt: timestamp('started_at', { withTimezone: true, mode: 'date' }),
	finishedAt: timestamp('finished_at', { withTimezone: true, mode: 'date' })
});
