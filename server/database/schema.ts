// Glint's tables. Ids are random (not guessable in URLs); times are milliseconds since the epoch.
import { sql } from 'drizzle-orm'
import { index, integer, primaryKey, real, sqliteTable, text, uniqueIndex } from 'drizzle-orm/sqlite-core'
import type { Affiliation, AnswerMode, DeckCategory, DeckStatus, TypeCategory } from '../../shared/schemas/decks'
import type { Role } from '../../shared/types/roles'

const now = sql`(unixepoch('subsec') * 1000)`
const timestamps = {
  createdAt: integer('created_at').notNull().default(now),
  updatedAt: integer('updated_at').notNull().default(now),
}

// ---------------------------------------------------------------- people

export const users = sqliteTable('users', {
  id: text('id').primaryKey(),
  email: text('email').notNull(),
  name: text('name').notNull(),
  passwordHash: text('password_hash').notNull(),
  disabled: integer('disabled', { mode: 'boolean' }).notNull().default(false),
  // Raised on sign-out and disable: sessions carrying an older value are refused.
  sessionVersion: integer('session_version').notNull().default(1),
  nightMode: text('night_mode').$type<'auto' | 'day' | 'night'>().notNull().default('auto'),
  remindersOptOut: integer('reminders_opt_out', { mode: 'boolean' }).notNull().default(false),
  // A lead's own choice to stop the weekly crew digest.
  digestOptOut: integer('digest_opt_out', { mode: 'boolean' }).notNull().default(false),
  ...timestamps,
}, t => [uniqueIndex('users_email_uq').on(t.email)])

export const userRoles = sqliteTable('user_roles', {
  userId: text('user_id').notNull().references(() => users.id, { onDelete: 'cascade' }),
  role: text('role').$type<Role>().notNull(),
}, t => [primaryKey({ columns: [t.userId, t.role] })])

export const crews = sqliteTable('crews', {
  id: text('id').primaryKey(),
  name: text('name').notNull(),
  // The crew's readiness standard, set by its lead.
  minAccuracy: real('min_accuracy').notNull().default(0.9),
  minCallsPerTrack: integer('min_calls_per_track').notNull().default(2),
  windowDays: integer('window_days').notNull().default(14),
  // Whether calls graded on the phone offline (the pack held their answers) count toward readiness.
  offlineCounts: integer('offline_counts', { mode: 'boolean' }).notNull().default(false),
  ...timestamps,
}, t => [uniqueIndex('crews_name_uq').on(t.name)])

export const memberships = sqliteTable('memberships', {
  crewId: text('crew_id').notNull().references(() => crews.id, { onDelete: 'cascade' }),
  userId: text('user_id').notNull().references(() => users.id, { onDelete: 'cascade' }),
  createdAt: integer('created_at').notNull().default(now),
}, t => [primaryKey({ columns: [t.crewId, t.userId] }), index('memberships_user_idx').on(t.userId)])

export const invitations = sqliteTable('invitations', {
  id: text('id').primaryKey(),
  tokenHash: text('token_hash').notNull(),
  email: text('email').notNull(),
  role: text('role').$type<Role>().notNull(),
  crewId: text('crew_id').references(() => crews.id, { onDelete: 'cascade' }),
  invitedBy: text('invited_by').notNull().references(() => users.id),
  expiresAt: integer('expires_at').notNull(),
  usedAt: integer('used_at'),
  // Set when an admin withdraws the link or a newer invitation to the same address replaces it.
  revokedAt: integer('revoked_at'),
  revokedReason: text('revoked_reason'), // revoked | replaced
  createdAt: integer('created_at').notNull().default(now),
}, t => [uniqueIndex('invitations_token_uq').on(t.tokenHash), index('invitations_email_idx').on(t.email)])

export const passwordResets = sqliteTable('password_resets', {
  id: text('id').primaryKey(),
  tokenHash: text('token_hash').notNull(),
  userId: text('user_id').notNull().references(() => users.id, { onDelete: 'cascade' }),
  expiresAt: integer('expires_at').notNull(),
  usedAt: integer('used_at'),
  createdAt: integer('created_at').notNull().default(now),
}, t => [uniqueIndex('password_resets_token_uq').on(t.tokenHash)])

export const mails = sqliteTable('mails', {
  id: text('id').primaryKey(),
  to: text('to').notNull(),
  subject: text('subject').notNull(),
  text: text('text').notNull(),
  html: text('html').notNull(),
  transport: text('transport').notNull(), // outbox | smtp
  status: text('status').notNull(), // sent | failed
  error: text('error'),
  sentAt: integer('sent_at').notNull().default(now),
}, t => [index('mails_sent_idx').on(t.sentAt)])

export const auditLog = sqliteTable('audit_log', {
  id: text('id').primaryKey(),
  actorId: text('actor_id').references(() => users.id, { onDelete: 'set null' }),
  action: text('action').notNull(),
  subjectType: text('subject_type').notNull(),
  subjectId: text('subject_id'),
  detail: text('detail', { mode: 'json' }).$type<Record<string, unknown>>(),
  createdAt: integer('created_at').notNull().default(now),
}, t => [index('audit_created_idx').on(t.createdAt)])

// ---------------------------------------------------------------- decks and silhouettes

export const decks = sqliteTable('decks', {
  id: text('id').primaryKey(),
  title: text('title').notNull(),
  description: text('description').notNull().default(''),
  category: text('category').$type<DeckCategory>().notNull(), // aircraft | vessel | mixed
  ownerId: text('owner_id').notNull().references(() => users.id),
  status: text('status').$type<DeckStatus>().notNull().default('draft'),
  hesitationMs: integer('hesitation_ms').notNull().default(1500),
  windowMs: integer('window_ms').notNull().default(5000),
  newPerDay: integer('new_per_day').notNull().default(10),
  retention: real('retention').notNull().default(0.9),
  choiceCount: integer('choice_count').notNull().default(4),
  answerMode: text('answer_mode').$type<AnswerMode>().notNull().default('choices'),
  minExposureMs: integer('min_exposure_ms').notNull().default(200),
  ...timestamps,
})

export const deckCrews = sqliteTable('deck_crews', {
  deckId: text('deck_id').notNull().references(() => decks.id, { onDelete: 'cascade' }),
  crewId: text('crew_id').notNull().references(() => crews.id, { onDelete: 'cascade' }),
}, t => [primaryKey({ columns: [t.deckId, t.crewId] }), index('deck_crews_crew_idx').on(t.crewId)])

export const targetTypes = sqliteTable('target_types', {
  id: text('id').primaryKey(),
  deckId: text('deck_id').notNull().references(() => decks.id, { onDelete: 'cascade' }),
  name: text('name').notNull(),
  category: text('category').$type<TypeCategory>().notNull(),
  affiliation: text('affiliation').$type<Affiliation>().notNull(),
  sizeM: real('size_m').notNull(),
  features: text('features', { mode: 'json' }).notNull().$type<Record<string, string>>(),
  // The shared definition this row is one deck's use of: every deck that uses a library type has
  // its own row (tracks, calls and sightings name the row), and all rows of one definition share
  // this id, their fields and their views' renderings. A new target type is its own definition.
  definitionId: text('definition_id').notNull(),
  ...timestamps,
}, t => [uniqueIndex('target_types_deck_name_uq').on(t.deckId, t.name), index('target_types_definition_idx').on(t.definitionId)])

export const lookAlikes = sqliteTable('look_alikes', {
  typeId: text('type_id').notNull().references(() => targetTypes.id, { onDelete: 'cascade' }),
  otherId: text('other_id').notNull().references(() => targetTypes.id, { onDelete: 'cascade' }),
}, t => [primaryKey({ columns: [t.typeId, t.otherId] })])

export const views = sqliteTable('views', {
  id: text('id').primaryKey(),
  targetTypeId: text('target_type_id').notNull().references(() => targetTypes.id, { onDelete: 'cascade' }),
  aspect: text('aspect').notNull(),
  sourceSha: text('source_sha').notNull(),
  width: integer('width').notNull(),
  height: integer('height').notNull(),
  ...timestamps,
}, t => [index('views_type_idx').on(t.targetTypeId)])

// A removed view waits here (its row and renderings' rows as they were, the files kept on disk) for
// VIEW_TRASH_DAYS, so that its instructor can restore it; then it is purged with its files.
export const removedViews = sqliteTable('removed_views', {
  id: text('id').primaryKey(), // the view's own id, reused on restore
  deckId: text('deck_id').notNull().references(() => decks.id, { onDelete: 'cascade' }),
  targetTypeId: text('target_type_id').notNull().references(() => targetTypes.id, { onDelete: 'cascade' }),
  aspect: text('aspect').notNull(),
  snapshot: text('snapshot', { mode: 'json' }).notNull().$type<{ view: Record<string, unknown>, variants: Record<string, unknown>[], together?: string[] }>(),
  removedBy: text('removed_by').references(() => users.id, { onDelete: 'set null' }),
  removedAt: integer('removed_at').notNull(),
}, t => [index('removed_views_deck_idx').on(t.deckId, t.removedAt)])

// One rendering of a view under one condition at one size; `file` is a content hash name.
export const variants = sqliteTable('variants', {
  id: text('id').primaryKey(),
  viewId: text('view_id').notNull().references(() => views.id, { onDelete: 'cascade' }),
  condition: text('condition').notNull(),
  width: integer('width').notNull(),
  height: integer('height').notNull(),
  bytes: integer('bytes').notNull(),
  contrast: real('contrast').notNull(),
  file: text('file').notNull(),
  // A file may be named by several variants: a target type copied to another deck shares its renderings.
}, t => [index('variants_view_idx').on(t.viewId), index('variants_file_idx').on(t.file)])

export const jobs = sqliteTable('jobs', {
  id: text('id').primaryKey(),
  userId: text('user_id').notNull().references(() => users.id, { onDelete: 'cascade' }),
  deckId: text('deck_id').references(() => decks.id, { onDelete: 'cascade' }),
  kind: text('kind').notNull(), // render
  state: text('state').notNull().default('queued'), // queued | running | done | failed
  progress: real('progress').notNull().default(0),
  message: text('message'),
  fileName: text('file_name'),
  viewId: text('view_id'),
  ...timestamps,
})

// ---------------------------------------------------------------- drilling

// FSRS card state in columns (ts-fsrs Card), one per trainee x target type x aspect.
export const tracks = sqliteTable('tracks', {
  id: text('id').primaryKey(),
  userId: text('user_id').notNull().references(() => users.id, { onDelete: 'cascade' }),
  deckId: text('deck_id').notNull().references(() => decks.id, { onDelete: 'cascade' }),
  targetTypeId: text('target_type_id').notNull().references(() => targetTypes.id, { onDelete: 'cascade' }),
  aspect: text('aspect').notNull(),
  due: integer('due').notNull(),
  stability: real('stability').notNull().default(0),
  difficulty: real('difficulty').notNull().default(0),
  elapsedDays: integer('elapsed_days').notNull().default(0),
  scheduledDays: integer('scheduled_days').notNull().default(0),
  learningSteps: integer('learning_steps').notNull().default(0),
  reps: integer('reps').notNull().default(0),
  lapses: integer('lapses').notNull().default(0),
  state: integer('state').notNull().default(0),
  lastReview: integer('last_review'),
  ...timestamps,
}, t => [
  uniqueIndex('tracks_user_type_aspect_uq').on(t.userId, t.targetTypeId, t.aspect),
  index('tracks_user_deck_due_idx').on(t.userId, t.deckId, t.due),
])

export const watches = sqliteTable('watches', {
  id: text('id').primaryKey(),
  userId: text('user_id').notNull().references(() => users.id, { onDelete: 'cascade' }),
  deckId: text('deck_id').references(() => decks.id, { onDelete: 'cascade' }),
  kind: text('kind').notNull().default('watch'), // watch | check
  checkId: text('check_id'),
  day: text('day').notNull(), // YYYY-MM-DD, the trainee's watch day
  status: text('status').notNull().default('open'), // open | closed
  // a practice watch, asked for when nothing was due; its calls count like any other
  practice: integer('practice', { mode: 'boolean' }).notNull().default(false),
  ...timestamps,
  closedAt: integer('closed_at'),
}, t => [index('watches_user_day_idx').on(t.userId, t.day)])

export const sightings = sqliteTable('sightings', {
  id: text('id').primaryKey(),
  watchId: text('watch_id').notNull().references(() => watches.id, { onDelete: 'cascade' }),
  userId: text('user_id').notNull().references(() => users.id, { onDelete: 'cascade' }),
  trackId: text('track_id').references(() => tracks.id, { onDelete: 'cascade' }),
  targetTypeId: text('target_type_id').notNull().references(() => targetTypes.id, { onDelete: 'cascade' }),
  position: integer('position').notNull(),
  variantId: text('variant_id').references(() => variants.id, { onDelete: 'set null' }),
  aspect: text('aspect').notNull(),
  condition: text('condition').notNull(),
  rangeM: real('range_m').notNull(),
  binoculars: integer('binoculars', { mode: 'boolean' }).notNull().default(true),
  apparentPx: real('apparent_px').notNull(),
  exposureMs: integer('exposure_ms').notNull(),
  windowMs: integer('window_ms').notNull(),
  choices: text('choices', { mode: 'json' }).notNull().$type<{ id: string, label: string }[]>(),
  answerChoiceId: text('answer_choice_id').notNull(),
  reshowOf: text('reshow_of'),
  voidedAt: integer('voided_at'),
  issuedAt: integer('issued_at').notNull(),
}, t => [index('sightings_watch_idx').on(t.watchId, t.position)])

// A picture a watch shows by an opaque id (introductions, reveals): one rendering of a type at an
// aspect, served only to the trainee the watch was issued to (server/routes/images/p/).
export const pictures = sqliteTable('pictures', {
  id: text('id').primaryKey(),
  watchId: text('watch_id').notNull().references(() => watches.id, { onDelete: 'cascade' }),
  userId: text('user_id').notNull().references(() => users.id, { onDelete: 'cascade' }),
  targetTypeId: text('target_type_id').notNull().references(() => targetTypes.id, { onDelete: 'cascade' }),
  aspect: text('aspect').notNull(),
  variantId: text('variant_id').notNull().references(() => variants.id, { onDelete: 'cascade' }),
}, t => [uniqueIndex('pictures_watch_type_aspect_uq').on(t.watchId, t.targetTypeId, t.aspect)])

// A track's introduction: shown just before the sighting `before_sighting_id` (several in `ord` order);
// not a call, no schedule change.
export const introductions = sqliteTable('introductions', {
  id: text('id').primaryKey(),
  watchId: text('watch_id').notNull().references(() => watches.id, { onDelete: 'cascade' }),
  userId: text('user_id').notNull().references(() => users.id, { onDelete: 'cascade' }),
  trackId: text('track_id').notNull().references(() => tracks.id, { onDelete: 'cascade' }),
  beforeSightingId: text('before_sighting_id').notNull().references(() => sightings.id, { onDelete: 'cascade' }),
  ord: integer('ord').notNull(),
  targetTypeId: text('target_type_id').notNull().references(() => targetTypes.id, { onDelete: 'cascade' }),
  aspect: text('aspect').notNull(),
  pictureId: text('picture_id').notNull().references(() => pictures.id, { onDelete: 'cascade' }),
  lookAlikeTypeId: text('look_alike_type_id').references(() => targetTypes.id, { onDelete: 'set null' }),
  lookAlikePictureId: text('look_alike_picture_id').references(() => pictures.id, { onDelete: 'set null' }),
}, t => [index('introductions_watch_idx').on(t.watchId, t.ord)])

// One call per sighting (the unique index makes a resend count once).
export const calls = sqliteTable('calls', {
  id: text('id').primaryKey(),
  sightingId: text('sighting_id').notNull().references(() => sightings.id, { onDelete: 'cascade' }),
  userId: text('user_id').notNull().references(() => users.id, { onDelete: 'cascade' }),
  deckId: text('deck_id').notNull().references(() => decks.id, { onDelete: 'cascade' }),
  trackId: text('track_id').references(() => tracks.id, { onDelete: 'cascade' }),
  targetTypeId: text('target_type_id').notNull(),
  calledTypeId: text('called_type_id'),
  aspect: text('aspect').notNull(),
  condition: text('condition').notNull(),
  choiceId: text('choice_id'),
  typed: text('typed'),
  correct: integer('correct', { mode: 'boolean' }).notNull(),
  grade: text('grade').notNull(), // missed | hesitant | sure | instant
  anticipation: integer('anticipation', { mode: 'boolean' }).notNull().default(false),
  latencyMs: integer('latency_ms'),
  framesShown: integer('frames_shown'),
  frameIntervalMs: real('frame_interval_ms'),
  calledAt: integer('called_at').notNull(),
  receivedAt: integer('received_at').notNull(),
  offline: integer('offline', { mode: 'boolean' }).notNull().default(false),
  // 'watch' (a drill call) or 'check' (a qualification check's call, shown on the check pages only).
  kind: text('kind').notNull().default('watch'),
  // FSRS state before and after, so a track's history can be replayed.
  before: text('before', { mode: 'json' }).$type<Record<string, number | null>>(),
  after: text('after', { mode: 'json' }).$type<Record<string, number | null>>(),
  result: text('result', { mode: 'json' }).$type<Record<string, unknown>>(),
}, t => [
  uniqueIndex('calls_sighting_uq').on(t.sightingId),
  // No separate (user, time) or (deck, time) index: the covering index below serves both through
  // its (user_id, deck_id) prefix, and every index is one more page written by each call.
  // Covers the crew table's per-person counts and latencies, so they are read from the index alone.
  // Drill calls only: a check's calls never enter the drill statistics (queries say kind = 'watch').
  index('calls_user_deck_time_idx').on(t.userId, t.deckId, t.calledAt, t.correct, t.grade, t.anticipation, t.latencyMs, t.aspect, t.condition, t.targetTypeId, t.offline)
    .where(sql`kind = 'watch'`),
  // Readiness counts the calls on each (target type, aspect) pair of a deck in the standard's window.
  index('calls_user_deck_pair_time_idx').on(t.userId, t.deckId, t.targetTypeId, t.aspect, t.calledAt, t.offline).where(sql`kind = 'watch'`),
])

export const tapBaselines = sqliteTable('tap_baselines', {
  id: text('id').primaryKey(),
  userId: text('user_id').notNull().references(() => users.id, { onDelete: 'cascade' }),
  simpleMs: real('simple_ms').notNull(),
  choiceMs: real('choice_ms').notNull(),
  trials: integer('trials').notNull(),
  createdAt: integer('created_at').notNull().default(now),
}, t => [index('tap_baselines_user_idx').on(t.userId, t.createdAt)])

// ---------------------------------------------------------------- checks

export const checks = sqliteTable('checks', {
  id: text('id').primaryKey(),
  deckId: text('deck_id').notNull().references(() => decks.id, { onDelete: 'cascade' }),
  title: text('title').notNull(),
  sightingCount: integer('sighting_count').notNull(),
  exposureMs: integer('exposure_ms').notNull(),
  conditions: text('conditions', { mode: 'json' }).notNull().$type<string[]>(),
  aspects: text('aspects', { mode: 'json' }).notNull().$type<string[]>(),
  passMark: real('pass_mark').notNull(),
  createdBy: text('created_by').notNull().references(() => users.id),
  // The day by which the crew should have taken it (end of that UTC day), or none.
  dueAt: integer('due_at'),
  // Retired: no longer offered to take, kept with its attempts and results.
  retiredAt: integer('retired_at'),
  // Only these target types of the deck are shown (JSON list), or null for all of them.
  targetTypeIds: text('target_type_ids', { mode: 'json' }).$type<string[]>(),
  ...timestamps,
})

export const checkAttempts = sqliteTable('check_attempts', {
  id: text('id').primaryKey(),
  checkId: text('check_id').notNull().references(() => checks.id, { onDelete: 'cascade' }),
  userId: text('user_id').notNull().references(() => users.id, { onDelete: 'cascade' }),
  watchId: text('watch_id').references(() => watches.id, { onDelete: 'set null' }),
  status: text('status').notNull().default('running'), // running | finished | reset
  score: real('score'),
  passed: integer('passed', { mode: 'boolean' }),
  signedOffBy: text('signed_off_by').references(() => users.id),
  signedOffAt: integer('signed_off_at'),
  signOffRemark: text('sign_off_remark'),
  // The last withdrawn sign-off: who, when and why (the audit log keeps every one).
  withdrawnBy: text('withdrawn_by').references(() => users.id),
  withdrawnAt: integer('withdrawn_at'),
  withdrawReason: text('withdraw_reason'),
  startedAt: integer('started_at').notNull(),
  finishedAt: integer('finished_at'),
}, t => [index('check_attempts_user_idx').on(t.userId, t.checkId)])

// ---------------------------------------------------------------- scan drill

export const scanDrills = sqliteTable('scan_drills', {
  id: text('id').primaryKey(),
  title: text('title').notNull(),
  settings: text('settings', { mode: 'json' }).notNull().$type<Record<string, unknown>>(),
  createdBy: text('created_by').notNull().references(() => users.id),
  ...timestamps,
})

export const scanDrillCrews = sqliteTable('scan_drill_crews', {
  drillId: text('drill_id').notNull().references(() => scanDrills.id, { onDelete: 'cascade' }),
  crewId: text('crew_id').notNull().references(() => crews.id, { onDelete: 'cascade' }),
}, t => [primaryKey({ columns: [t.drillId, t.crewId] })])

// A pass the server has started: the seed it drew (or, for the practice sector only, the seed the
// trainee asked for), the settings it runs with, when it was issued and when its pass was sent.
export const scanStarts = sqliteTable('scan_starts', {
  id: text('id').primaryKey(),
  userId: text('user_id').notNull().references(() => users.id, { onDelete: 'cascade' }),
  drillId: text('drill_id').references(() => scanDrills.id, { onDelete: 'set null' }),
  seed: integer('seed').notNull(),
  seedChosen: integer('seed_chosen', { mode: 'boolean' }).notNull().default(false),
  settings: text('settings', { mode: 'json' }).notNull().$type<Record<string, unknown>>(),
  issuedAt: integer('issued_at').notNull(),
  usedAt: integer('used_at'),
}, t => [index('scan_starts_user_idx').on(t.userId, t.issuedAt)])

export const scanPasses = sqliteTable('scan_passes', {
  id: text('id').primaryKey(),
  userId: text('user_id').notNull().references(() => users.id, { onDelete: 'cascade' }),
  drillId: text('drill_id').references(() => scanDrills.id, { onDelete: 'set null' }),
  score: text('score', { mode: 'json' }).notNull().$type<Record<string, unknown>>(),
  coverage: real('coverage').notNull(),
  contactsFound: integer('contacts_found').notNull(),
  contactsShown: integer('contacts_shown').notNull(),
  createdAt: integer('created_at').notNull().default(now),
}, t => [index('scan_passes_user_idx').on(t.userId, t.createdAt)])

// ---------------------------------------------------------------- fitted scheduling

// Each crew's FSRS parameters fitted from its own calls (server/domain/crew-fits.ts): the last fit's
// state and figures, and the set the scheduler uses (adopted_weights; NULL = the library's defaults).
export const crewFsrsParams = sqliteTable('crew_fsrs_params', {
  crewId: text('crew_id').primaryKey().references(() => crews.id, { onDelete: 'cascade' }),
  status: text('status').notNull().default('idle'), // idle | running | done | too-few | failed
  progress: real('progress').notNull().default(0),
  message: text('message'),
  calls: integer('calls').notNull().default(0),
  tracks: integer('tracks').notNull().default(0),
  // calls still needed before a fit is tried
  needed: integer('needed').notNull().default(0),
  defaultLogLoss: real('default_log_loss'),
  defaultRmse: real('default_rmse'),
  fittedLogLoss: real('fitted_log_loss'),
  fittedRmse: real('fitted_rmse'),
  fittedWeights: text('fitted_weights', { mode: 'json' }).$type<number[]>(),
  adoptedWeights: text('adopted_weights', { mode: 'json' }).$type<number[]>(),
  requestedBy: text('requested_by'),
  startedAt: integer('started_at'),
  finishedAt: integer('finished_at'),
  ...timestamps,
})
