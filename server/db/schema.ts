/**
 * The Drizzle schema of Tiltwatch's PostgreSQL database (PGlite or a PostgreSQL server).
 * Migrations in drizzle/ are generated from this file with `npm run db:generate`.
 *
 * Telemetry is stored for kHz rates: one `fast_batches` row holds a contiguous run of frames
 * (about 0.5 s of 1 kHz samples per channel, as compressed converter codes in bytea: see
 * server/storage/sample-codec.ts), never a row per sample; `rollups_1s` keeps per-second
 * statistics for long windows. The telemetry tables are written by the storage worker
 * thread; with PGlite they live in their own cluster (`telemetry/` in the data folder), so
 * they carry no foreign keys into the other tables.
 */
import { sql } from 'drizzle-orm';
import {
  bigint,
  bigserial,
  boolean,
  check,
  customType,
  doublePrecision,
  index,
  integer,
  jsonb,
  pgTable,
  primaryKey,
  real,
  serial,
  smallint,
  text,
  type AnyPgColumn,
  timestamp,
  uniqueIndex,
} from 'drizzle-orm/pg-core';
import type { AlarmEventKind, AlarmSuppression } from '../../shared/alarms/alarm-api.js';
import type { LogbookLinkKind } from '../../shared/logbook/logbook-api.js';
import type { HandoverItem, HandoverNotes, HandoverRecord, HandoverStatus } from '../../shared/handover/handover-api.js';
import type { Role } from '../../shared/auth/roles.js';
import type { CalibrationBody } from '../../shared/field/calibration.js';
import type { CalibrationFitReport, CalibrationKind, CalibrationState, FitPoint } from '../../shared/field/calibration-record.js';
import type { LivePrediction, PredictionStatus } from '../../shared/live/live-state.js';
import type { LevelSet } from '../../shared/levels/level-set.js';
import type { SampleProfile } from '../../shared/profiles/sample-profile.js';
import type { RunState, SequenceStep, ShotPrediction, ShotRecord, StepOutcome } from '../../shared/steering/steering-api.js';
import type { AlarmLimit, AlarmPriority } from '../alarms/alarm-limit.js';
import type { AlarmMemory, AlarmState } from '../alarms/alarm-state.js';
import type { FirstOut } from '../interlock/interlock.js';
import type { ConditionStatus } from '../interlock/trip-conditions.js';
import type { StoredSteering } from '../steering/stored-steering.js';

/** Compressed converter codes of the six fast channels (see server/storage/sample-codec.ts). */
const sampleBlob = customType<{ data: Uint8Array; driverData: Uint8Array }>({
  dataType: () => 'bytea',
});

const epochMs = (name: string) => bigint(name, { mode: 'number' });

export const users = pgTable('users', {
  id: serial('id').primaryKey(),
  /** Lower-case e-mail address, the sign-in name. */
  email: text('email').notNull().unique(),
  role: text('role').$type<Role>().notNull(),
  /** argon2id PHC string. */
  passwordHash: text('password_hash').notNull(),
  createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  /** A disabled account cannot sign in and its tokens are refused. */
  disabled: boolean('disabled').notNull().default(false),
  /**
   * Carried in every token as `tv`; raised when the account is disabled, its role or password
   * changes, which revokes every token issued before.
   */
  tokenVersion: integer('token_version').notNull().default(0),
});

/** Sign-in throttling and other security events an admin reviews (Admin → Users). */
export const securityEvents = pgTable(
  'security_events',
  {
    id: bigserial('id', { mode: 'number' }).primaryKey(),
    at: timestamp('at', { withTimezone: true }).notNull().defaultNow(),
    /** e.g. `sign-in.account-delayed`, `sign-in.address-throttled`, `sign-in.throttle-lifted`. */
    kind: text('kind').notNull(),
    /** The account concerned (normalised e-mail), when there is one. */
    email: text('email'),
    /** The client address, when there is one. */
    address: text('address'),
    detail: jsonb('detail'),
  },
  (t) => [index('security_events_at').on(t.at)],
);

export const calibrations = pgTable(
  'calibrations',
  {
    id: serial('id').primaryKey(),
    version: integer('version').notNull().unique(),
    label: text('label').notNull(),
    /** K, G/A. */
    gaussPerAmp: jsonb('gauss_per_amp').$type<CalibrationBody['gaussPerAmp']>().notNull(),
    /** B0, G (coil frame). */
    offsetGauss: jsonb('offset_gauss').$type<CalibrationBody['offsetGauss']>().notNull(),
    /** R, coil frame → trap frame. */
    coilToTrap: jsonb('coil_to_trap').$type<CalibrationBody['coilToTrap']>().notNull(),
    createdBy: text('created_by').notNull(),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
    approvedBy: text('approved_by'),
    approvedAt: timestamp('approved_at', { withTimezone: true }),
    active: boolean('active').notNull().default(false),
    /** `draft` after a fit, `approved` once a lead approved it (then immutable: trigger in drizzle/). */
    state: text('state').$type<CalibrationState>().notNull().default('approved'),
    kind: text('kind').$type<CalibrationKind>().notNull().default('demo'),
    /** The fit report (same object as the calibrate CLI prints); null for the demo seed. */
    fit: jsonb('fit').$type<CalibrationFitReport>(),
    /** Every file line with its residual. */
    fitPoints: jsonb('fit_points').$type<FitPoint[]>(),
    /** 12×12 covariance of (K row-major, B0), coil frame. */
    covariance: jsonb('covariance').$type<number[][]>(),
    sourceName: text('source_name'),
    mhzPerGauss: doublePrecision('mhz_per_gauss'),
    approvalReason: text('approval_reason'),
  },
  (t) => [
    // At most one row may be active; the seed and every switch keep exactly one.
    uniqueIndex('calibrations_one_active').on(t.active).where(sql`${t.active}`),
    check('calibrations_active_is_approved', sql`NOT ${t.active} OR ${t.state} = 'approved'`),
    check('calibrations_state', sql`${t.state} IN ('draft', 'approved')`),
  ],
);

/**
 * Sample profiles (issue 3): every save adds a version under its name, never changes a stored
 * one; `body` is the whole validated SampleProfile.
 */
export const sampleProfiles = pgTable(
  'sample_profiles',
  {
    id: serial('id').primaryKey(),
    name: text('name').notNull(),
    version: integer('version').notNull(),
    body: jsonb('body').$type<SampleProfile>().notNull(),
    active: boolean('active').notNull().default(false),
    createdBy: text('created_by').notNull(),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
    reason: text('reason').notNull(),
  },
  // At most one row may be active, as for calibrations; versions are unique per name.
  (t) => [
    uniqueIndex('sample_profiles_name_version').on(t.name, t.version),
    uniqueIndex('sample_profiles_one_active').on(t.active).where(sql`${t.active}`),
  ],
);

export const fastBatches = pgTable(
  'fast_batches',
  {
    id: bigserial('id', { mode: 'number' }).primaryKey(),
    /** Time of the first sample, Unix epoch ms (UTC). */
    t0Ms: epochMs('t0_ms').notNull(),
    /** Time just after the last sample (t0 + n/rate), Unix epoch ms. */
    t1Ms: epochMs('t1_ms').notNull(),
    seqFirst: bigint('seq_first', { mode: 'number' }).notNull(),
    seqLast: bigint('seq_last', { mode: 'number' }).notNull(),
    rateHz: doublePrecision('rate_hz').notNull(),
    sampleCount: integer('sample_count').notNull(),
    /** Calibration in force when the batch arrived (`calibrations.id`; no foreign key, see above). */
    calibrationId: integer('calibration_id'),
    /** How `samples` is encoded (server/storage/sample-codec.ts `SAMPLE_CODEC`). */
    codec: smallint('codec').notNull(),
    /** Currents x, y, z (A) and voltages x, y, z (V), `sample_count` each. */
    samples: sampleBlob('samples').notNull(),
    /** 100 ms block means of the currents (server/storage/block-means.ts); null for rows stored before it existed. */
    blockMeans: sampleBlob('block_means'),
    /** Setpoints of the batch's last frame, A. */
    setpointX: real('setpoint_x').notNull(),
    setpointY: real('setpoint_y').notNull(),
    setpointZ: real('setpoint_z').notNull(),
  },
  (t) => [index('fast_batches_t1').on(t.t1Ms)],
);

export const slowSamples = pgTable(
  'slow_samples',
  {
    id: bigserial('id', { mode: 'number' }).primaryKey(),
    tMs: epochMs('t_ms').notNull(),
    seq: bigint('seq', { mode: 'number' }).notNull(),
    coilTempX: real('coil_temp_x').notNull(),
    coilTempY: real('coil_temp_y').notNull(),
    coilTempZ: real('coil_temp_z').notNull(),
    flowX: real('flow_x').notNull(),
    flowY: real('flow_y').notNull(),
    flowZ: real('flow_z').notNull(),
    waterSupplyC: real('water_supply_c').notNull(),
    waterReturnX: real('water_return_x').notNull(),
    waterReturnY: real('water_return_y').notNull(),
    waterReturnZ: real('water_return_z').notNull(),
  },
  (t) => [index('slow_samples_t').on(t.tMs)],
);

/**
 * Per-second statistics. Current statistics are over every raw sample; field statistics over
 * the 100 Hz block means; θ and φ are the angles of the mean field vector (a mean of φ would
 * break at the 0/360° wrap). Temperatures keep their maximum and flows their minimum, the
 * directions that trip. Slow columns are null for a second without slow frames.
 */
export const rollups1s = pgTable('rollups_1s', {
  /** Start of the second, Unix epoch ms. */
  tMs: epochMs('t_ms').primaryKey(),
  fastSamples: integer('fast_samples').notNull(),
  currentXMean: real('current_x_mean').notNull(),
  currentXMin: real('current_x_min').notNull(),
  currentXMax: real('current_x_max').notNull(),
  currentYMean: real('current_y_mean').notNull(),
  currentYMin: real('current_y_min').notNull(),
  currentYMax: real('current_y_max').notNull(),
  currentZMean: real('current_z_mean').notNull(),
  currentZMin: real('current_z_min').notNull(),
  currentZMax: real('current_z_max').notNull(),
  bXMean: real('b_x_mean').notNull(),
  bYMean: real('b_y_mean').notNull(),
  bZMean: real('b_z_mean').notNull(),
  bMagMean: real('b_mag_mean').notNull(),
  bMagMin: real('b_mag_min').notNull(),
  bMagMax: real('b_mag_max').notNull(),
  thetaDeg: real('theta_deg'),
  phiDeg: real('phi_deg'),
  slowSamples: integer('slow_samples').notNull(),
  tempXMean: real('temp_x_mean'),
  tempXMax: real('temp_x_max'),
  tempYMean: real('temp_y_mean'),
  tempYMax: real('temp_y_max'),
  tempZMean: real('temp_z_mean'),
  tempZMax: real('temp_z_max'),
  flowXMean: real('flow_x_mean'),
  flowXMin: real('flow_x_min'),
  flowYMean: real('flow_y_mean'),
  flowYMin: real('flow_y_min'),
  flowZMean: real('flow_z_mean'),
  flowZMin: real('flow_z_min'),
  /**
   * Mean one-standard-deviation σ|B| (G), σθ, σφ (degrees) over the second's fast frames, from
   * the covariance of the calibration each frame was read with; null without a covariance.
   */
  sigmaBMagMean: real('sigma_b_mag_mean'),
  sigmaThetaMean: real('sigma_theta_mean'),
  sigmaPhiMean: real('sigma_phi_mean'),
});

/**
 * Live predictions as they were shown (one row per prediction, at its `computedAt`; a later
 * collapse-ratio update of the same prediction replaces the row), kept as long as the roll-ups.
 * Angles are the trap-frame direction the prediction was made for.
 */
export const predictionSamples = pgTable('prediction_samples', {
  /** `computedAt`, Unix epoch ms. */
  tMs: epochMs('t_ms').primaryKey(),
  profileId: integer('profile_id').notNull(),
  thetaDeg: real('theta_deg').notNull(),
  phiDeg: real('phi_deg').notNull(),
  stable: boolean('stable').notNull(),
  reason: text('reason'),
  epsDd: real('eps_dd').notNull(),
  fermiSurfaceAspect: real('fermi_surface_aspect'),
  cloudAspect: real('cloud_aspect'),
  tofAspect: real('tof_aspect'),
  tofMajorAngleDeg: real('tof_major_angle_deg'),
  collapseRatio: real('collapse_ratio'),
  /** The camera view (LivePrediction `camera`), null when the profile has none. */
  camera: jsonb('camera').$type<LivePrediction['camera']>(),
});

/**
 * Each change of whether the live prediction describes the gas (`PredictionStatus`), at the
 * server time it changed, so Replay greys the prediction where Live did and says why. Kept in
 * the main database by server/prediction (not with the predictions, off the telemetry path), as
 * long as the roll-ups; the status holds until the next row.
 */
export const predictionStatusChanges = pgTable(
  'prediction_status_changes',
  {
    id: bigserial('id', { mode: 'number' }).primaryKey(),
    /** Server time of the change, Unix epoch ms. */
    tMs: epochMs('t_ms').notNull(),
    state: text('state').$type<PredictionStatus['state']>().notNull(),
    /** |B| of the newest frame at the change, G. */
    fieldG: real('field_g'),
    /** The least field that orients the dipoles in force, G. */
    minFieldG: real('min_field_g'),
    /** The sentence Live showed at the change; null while the prediction applies. */
    reason: text('reason'),
    /** While stale: when the newest frame arrived (server time, Unix epoch ms), to word the growing age. */
    lastFrameAtMs: epochMs('last_frame_at_ms'),
  },
  (t) => [index('prediction_status_changes_t').on(t.tMs)],
);

/** Append-only trail of every change and operator action; a trigger refuses UPDATE and DELETE. */
export const auditLog = pgTable(
  'audit_log',
  {
    id: bigserial('id', { mode: 'number' }).primaryKey(),
    at: timestamp('at', { withTimezone: true }).notNull().defaultNow(),
    /** E-mail of the person, or `system` for the server's own actions. */
    actor: text('actor').notNull(),
    action: text('action').notNull(),
    subject: text('subject').notNull(),
    oldValue: jsonb('old_value'),
    newValue: jsonb('new_value'),
    reason: text('reason'),
  },
  (t) => [index('audit_log_at').on(t.at)],
);

/**
 * The alarm limits in force (issue 4), one row per alarm id; `definition` is the whole
 * validated AlarmLimit. Seeded from the demo set; only a lead changes a row, audited.
 */
export const alarmLimits = pgTable('alarm_limits', {
  id: text('id').primaryKey(),
  definition: jsonb('definition').$type<AlarmLimit>().notNull(),
  updatedBy: text('updated_by').notNull(),
  updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
});

/**
 * Versions of the lead-set level set (display bands, trip levels, operating settings): every
 * edit adds a version with its reason, never changes a stored one; the newest is in force.
 */
export const levelSets = pgTable('level_sets', {
  id: serial('id').primaryKey(),
  version: integer('version').notNull().unique(),
  body: jsonb('body').$type<LevelSet>().notNull(),
  createdBy: text('created_by').notNull(),
  createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  reason: text('reason').notNull(),
});

/** Every alarm transition (raise, clear, acknowledge, shelve, …): the alarm history. */
export const alarmEvents = pgTable(
  'alarm_events',
  {
    id: bigserial('id', { mode: 'number' }).primaryKey(),
    /** Server time of the transition, Unix epoch ms. */
    atMs: epochMs('at_ms').notNull(),
    alarmId: text('alarm_id').notNull(),
    channel: text('channel').notNull(),
    priority: text('priority').$type<AlarmPriority>().notNull(),
    kind: text('kind').$type<AlarmEventKind>().notNull(),
    fromState: text('from_state').$type<AlarmState>().notNull(),
    toState: text('to_state').$type<AlarmState>().notNull(),
    /** Channel value at the transition (channel unit). */
    value: doublePrecision('value'),
    /** The alarm's level at the time (channel unit). */
    limitValue: doublePrecision('limit_value').notNull(),
    actor: text('actor'),
    reason: text('reason'),
    hidden: text('hidden').$type<AlarmSuppression>(),
    firstOutOf: text('first_out_of'),
  },
  (t) => [index('alarm_events_at').on(t.atMs)],
);

/** Software-interlock trips: first-out, every condition at the trip, and the reset. */
export const interlockTrips = pgTable('interlock_trips', {
  id: serial('id').primaryKey(),
  /** Unix epoch ms; one trip at a time, so the time identifies it. */
  trippedAtMs: epochMs('tripped_at_ms').notNull().unique(),
  firstOut: jsonb('first_out').$type<FirstOut>().notNull(),
  valuesAtTrip: jsonb('values_at_trip').$type<ConditionStatus[]>().notNull(),
  reason: text('reason').notNull(),
  resetAtMs: epochMs('reset_at_ms'),
  resetBy: text('reset_by'),
  resetReason: text('reset_reason'),
});

/** Sequences of steering steps, versioned by name; a stored version never changes. */
export const sequences = pgTable(
  'sequences',
  {
    id: serial('id').primaryKey(),
    name: text('name').notNull(),
    version: integer('version').notNull(),
    steps: jsonb('steps').$type<SequenceStep[]>().notNull(),
    createdBy: text('created_by').notNull(),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
    reason: text('reason').notNull(),
  },
  (t) => [uniqueIndex('sequences_name_version').on(t.name, t.version)],
);

/** Runs of a sequence version. */
export const runs = pgTable('runs', {
  id: serial('id').primaryKey(),
  sequenceId: integer('sequence_id').notNull().references(() => sequences.id),
  state: text('state').$type<RunState>().notNull(),
  startedAt: timestamp('started_at', { withTimezone: true }).notNull(),
  endedAt: timestamp('ended_at', { withTimezone: true }),
  step: integer('step').notNull().default(0),
  actor: text('actor').notNull(),
  reason: text('reason').notNull(),
  endReason: text('end_reason'),
});

/**
 * The steps of runs as the runner reached them: the step as the sequence gave it, when it began
 * and when and how it ended (`done`, `aborted`, `tripped`; null while it goes).
 */
export const runSteps = pgTable(
  'run_steps',
  {
    runId: integer('run_id').notNull().references(() => runs.id),
    stepIndex: integer('step_index').notNull(),
    step: jsonb('step').$type<SequenceStep>().notNull(),
    startedAt: timestamp('started_at', { withTimezone: true }).notNull(),
    endedAt: timestamp('ended_at', { withTimezone: true }),
    outcome: text('outcome').$type<StepOutcome>(),
  },
  (t) => [primaryKey({ columns: [t.runId, t.stepIndex] }), index('run_steps_started_at').on(t.startedAt)],
);

/** Shots of runs: the measured field and the prediction at the moment an image was taken. */
export const shots = pgTable(
  'shots',
  {
    /** Unique across the lab; written by the imaging analysis next to its images. */
    id: text('id').primaryKey(),
    runId: integer('run_id').notNull().references(() => runs.id),
    stepIndex: integer('step_index').notNull(),
    label: text('label').notNull(),
    at: timestamp('at', { withTimezone: true }).notNull(),
    field: jsonb('field').$type<ShotRecord['field']>().notNull(),
    prediction: jsonb('prediction').$type<ShotPrediction>(),
    profileId: integer('profile_id'),
  },
  (t) => [index('shots_run').on(t.runId)],
);

/**
 * The TOF image of a shot as the imaging analysis measured it: one row per shot, replaced by a
 * later upload (the audit log keeps the earlier value).
 */
export const shotMeasurements = pgTable('shot_measurements', {
  shotId: text('shot_id')
    .primaryKey()
    .references(() => shots.id),
  /** Long over short axis of the column density, ≥ 1. */
  tofAspect: doublePrecision('tof_aspect').notNull(),
  /** Angle of the long axis in the camera frame, degrees. */
  tofAngleDeg: doublePrecision('tof_angle_deg').notNull(),
  /** One standard deviation of `tofAspect`; null when the file gave none. */
  sigma: doublePrecision('sigma'),
  sourceName: text('source_name').notNull(),
  uploadedBy: text('uploaded_by').notNull(),
  uploadedAt: timestamp('uploaded_at', { withTimezone: true }).notNull(),
});

/** PostgreSQL text-search document (written by the database, never by the application). */
const tsvector = customType<{ data: string }>({ dataType: () => 'tsvector' });
const bytea = customType<{ data: Uint8Array; driverData: Uint8Array }>({ dataType: () => 'bytea' });

/**
 * Logbook entries, append-only (a trigger refuses UPDATE and DELETE): a correction is a new
 * entry whose `amends` names the one it corrects. `at` is the time the note refers to;
 * `search` is the English text-search document of `text` (GIN-indexed).
 */
export const logbookEntries = pgTable(
  'logbook_entries',
  {
    id: serial('id').primaryKey(),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
    at: timestamp('at', { withTimezone: true }).notNull(),
    author: text('author').notNull(),
    text: text('text').notNull(),
    tags: text('tags').array().notNull().default(sql`'{}'::text[]`),
    linkKind: text('link_kind').$type<LogbookLinkKind>(),
    linkRef: text('link_ref'),
    amends: integer('amends').references((): AnyPgColumn => logbookEntries.id),
    search: tsvector('search')
      .notNull()
      .generatedAlwaysAs((): ReturnType<typeof sql> => sql`to_tsvector('english'::regconfig, ${logbookEntries.text})`),
  },
  (t) => [
    index('logbook_entries_at').on(t.at),
    index('logbook_entries_search').using('gin', t.search),
    index('logbook_entries_tags').using('gin', t.tags),
    index('logbook_entries_amends').on(t.amends),
  ],
);

/** Files attached to logbook entries (type checked by content before storing), append-only. */
export const logbookAttachments = pgTable(
  'logbook_attachments',
  {
    id: serial('id').primaryKey(),
    entryId: integer('entry_id')
      .notNull()
      .references(() => logbookEntries.id),
    fileName: text('file_name').notNull(),
    /** MIME type found from the content, the one the file is served with. */
    contentType: text('content_type').notNull(),
    sizeBytes: integer('size_bytes').notNull(),
    data: bytea('data').notNull(),
  },
  (t) => [index('logbook_attachments_entry').on(t.entryId)],
);

/**
 * Shift handovers: a draft filled from the records of the shift (`record`), the outgoing
 * person's additions (`summary`, `notes`, `newItems`), submission and acceptance. At most one
 * handover is not yet accepted; an accepted one is frozen (a trigger refuses any change), with
 * the open items as they stood at acceptance in `itemsAtAcceptance`.
 */
export const handovers = pgTable('handovers', {
  id: serial('id').primaryKey(),
  status: text('status').$type<HandoverStatus>().notNull(),
  author: text('author').notNull(),
  createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  periodFrom: timestamp('period_from', { withTimezone: true }).notNull(),
  periodTo: timestamp('period_to', { withTimezone: true }).notNull(),
  record: jsonb('record').$type<HandoverRecord>().notNull(),
  summary: text('summary').notNull().default(''),
  notes: jsonb('notes').$type<HandoverNotes>().notNull().default({}),
  /** Items added in this handover; they become open items when it is submitted. */
  newItems: jsonb('new_items').$type<{ text: string }[]>().notNull().default([]),
  /** Open items carried in from earlier handovers (ids of `handover_items`). */
  carriedItemIds: jsonb('carried_item_ids').$type<number[]>().notNull().default([]),
  submittedBy: text('submitted_by'),
  submittedAt: timestamp('submitted_at', { withTimezone: true }),
  acceptedBy: text('accepted_by'),
  acceptedAt: timestamp('accepted_at', { withTimezone: true }),
  acceptComment: text('accept_comment'),
  itemsAtAcceptance: jsonb('items_at_acceptance').$type<HandoverItem[]>(),
});

/** Open items handed from shift to shift until someone closes them with a note. */
export const handoverItems = pgTable('handover_items', {
  id: serial('id').primaryKey(),
  text: text('text').notNull(),
  /** The handover that opened it. */
  handoverId: integer('handover_id')
    .notNull()
    .references(() => handovers.id),
  openedBy: text('opened_by').notNull(),
  openedAt: timestamp('opened_at', { withTimezone: true }).notNull().defaultNow(),
  closedBy: text('closed_by'),
  closedAt: timestamp('closed_at', { withTimezone: true }),
  closeNote: text('close_note'),
});

/**
 * The state of each alarm that must survive a restart (acknowledged, latched, shelved with its
 * expiry, out of service, raise time and value, first-out group): one row per alarm id, written
 * with each operator action and with each stored batch of alarm transitions.
 */
export const alarmStates = pgTable('alarm_states', {
  alarmId: text('alarm_id').primaryKey(),
  memory: jsonb('memory').$type<AlarmMemory>().notNull(),
  /** Server time of the write, Unix epoch ms. */
  updatedAtMs: epochMs('updated_at_ms').notNull(),
});

/**
 * What steering had in force when it last changed (server/steering/stored-steering.ts, written by steering-store.ts): one row
 * (id 1), written with the audit entry of each steer command and after every other change.
 */
export const steeringState = pgTable('steering_state', {
  id: integer('id').primaryKey(),
  state: jsonb('state').$type<StoredSteering>().notNull(),
  /** Server time of the write, Unix epoch ms. */
  updatedAtMs: epochMs('updated_at_ms').notNull(),
});

/**
 * Supervision records (trips, alarm transitions) taken from the journal in the data folder
 * (server/alarms/supervision-journal.ts): the id of each record written, in the same
 * transaction as the record, so a replay after a write whose confirmation was lost skips it.
 * Ids of records no longer in the journal file are pruned (server/alarms/applied-records.ts).
 */
export const supervisionRecordsApplied = pgTable('supervision_records_applied', {
  id: text('id').primaryKey(),
  /** Server time of the write, Unix epoch ms. */
  appliedAtMs: epochMs('applied_at_ms').notNull(),
});

/**
 * Sign-in throttles that outlive a restart (server/auth/sign-in-throttle.ts): per account the
 * failures and the time of the next attempt, per client address the failure times in the window.
 */
export const signInThrottles = pgTable(
  'sign_in_throttles',
  {
    scope: text('scope').$type<'account' | 'address'>().notNull(),
    key: text('key').notNull(),
    /** Account: { failures, lastFailureAt, nextAttemptAt }; address: failure times, Unix epoch ms. */
    state: jsonb('state').notNull(),
  },
  (t) => [primaryKey({ columns: [t.scope, t.key] })],
);

export const schema = {
  users,
  calibrations,
  sampleProfiles,
  fastBatches,
  slowSamples,
  rollups1s,
  predictionSamples,
  predictionStatusChanges,
  auditLog,
  securityEvents,
  alarmLimits,
  levelSets,
  alarmEvents,
  interlockTrips,
  sequences,
  runs,
  shots,
  shotMeasurements,
  logbookEntries,
  logbookAttachments,
  handovers,
  handoverItems,
  alarmStates,
  supervisionRecordsApplied,
  signInThrottles,
};
