import { sql } from 'drizzle-orm'
import { bigint, boolean, char, datetime, decimal, index, int, mysqlEnum, mysqlTable, primaryKey, text, uniqueIndex, varchar } from 'drizzle-orm/mysql-core'
import { ROLES } from '../../shared/schemas/account'
import { BANK_KINDS } from '../../shared/schemas/banks'
import { ATTEMPT_STATUSES, FEEDBACK } from '../../shared/schemas/hunts'
import type { Fault } from '../../shared/hunts/faults'
import { jsonDocument } from './json-document'

// One list of roles for the database, the server and the forms.
export const roles = ROLES
export type { Role } from '../../shared/schemas/account'

const createdAt = () =>
  datetime('created_at', { mode: 'date', fsp: 3 }).notNull().default(sql`CURRENT_TIMESTAMP(3)`)
const updatedAt = () =>
  datetime('updated_at', { mode: 'date', fsp: 3 })
    .notNull()
    .default(sql`CURRENT_TIMESTAMP(3)`)
    .$onUpdate(() => new Date())

export const users = mysqlTable('users', {
  id: int('id').autoincrement().primaryKey(),
  email: varchar('email', { length: 254 }).notNull().unique('users_email_unique'),
  name: varchar('name', { length: 120 }).notNull(),
  role: mysqlEnum('role', roles).notNull().default('student'),
  passwordHash: varchar('password_hash', { length: 255 }).notNull(),
  active: boolean('active').notNull().default(true),
  // Bumped to sign a user out everywhere: sessions carry the version they were made with.
  sessionVersion: int('session_version').notNull().default(0),
  createdAt: createdAt(),
  updatedAt: updatedAt(),
})

/**
 * A saved circuit document (shared/circuit-format.md). The document is kept as the
 * editor saved it; `version` counts saves so concurrent edits can be detected.
 */
export const banks = mysqlTable('banks', {
  id: int('id').autoincrement().primaryKey(),
  ownerId: int('owner_id').notNull().references(() => users.id, { onDelete: 'restrict' }),
  name: varchar('name', { length: 160 }).notNull(),
  document: jsonDocument<Record<string, unknown>>('document').notNull(),
  version: int('version').notNull().default(1),
  // 'site-check': saved from /site-check; its document also carries the planner's inputs
  kind: mysqlEnum('kind', BANK_KINDS).notNull().default('bank'),
  deletedAt: datetime('deleted_at', { mode: 'date', fsp: 3 }),
  // A read-only link's token (GET /api/shared/[token]); null when the bank is not shared.
  // Kept as is, not hashed, so the owner can copy the link again.
  shareToken: varchar('share_token', { length: 64 }),
  createdAt: createdAt(),
  updatedAt: updatedAt(),
}, table => [
  index('banks_owner_idx').on(table.ownerId, table.deletedAt),
  uniqueIndex('banks_share_token_unique').on(table.shareToken),
])

/** A password reset link: the token is mailed, only its SHA-256 is kept; single use. */
export const passwordResets = mysqlTable('password_resets', {
  id: int('id').autoincrement().primaryKey(),
  userId: int('user_id').notNull().references(() => users.id, { onDelete: 'cascade' }),
  tokenHash: char('token_hash', { length: 64 }).notNull().unique('password_resets_token_unique'),
  expiresAt: datetime('expires_at', { mode: 'date', fsp: 3 }).notNull(),
  usedAt: datetime('used_at', { mode: 'date', fsp: 3 }),
  createdAt: createdAt(),
})

/**
 * A sign-up waiting for its address to be confirmed: the mailed token is kept only as its
 * SHA-256, with what the account will be made from (the password already hashed); single use.
 */
export const pendingSignUps = mysqlTable('pending_sign_ups', {
  id: int('id').autoincrement().primaryKey(),
  tokenHash: char('token_hash', { length: 64 }).notNull().unique('pending_sign_ups_token_unique'),
  email: varchar('email', { length: 254 }).notNull(),
  name: varchar('name', { length: 120 }).notNull(),
  role: mysqlEnum('role', roles).notNull(),
  passwordHash: varchar('password_hash', { length: 255 }).notNull(),
  expiresAt: datetime('expires_at', { mode: 'date', fsp: 3 }).notNull(),
  usedAt: datetime('used_at', { mode: 'date', fsp: 3 }),
  createdAt: createdAt(),
}, table => [
  index('pending_sign_ups_email_idx').on(table.email),
])

/** An instructor invitation an admin sent by e-mail; the token is kept as its SHA-256. */
export const invitations = mysqlTable('invitations', {
  id: int('id').autoincrement().primaryKey(),
  email: varchar('email', { length: 254 }).notNull(),
  name: varchar('name', { length: 120 }),
  tokenHash: char('token_hash', { length: 64 }).notNull().unique('invitations_token_unique'),
  invitedBy: int('invited_by').notNull().references(() => users.id, { onDelete: 'restrict' }),
  expiresAt: datetime('expires_at', { mode: 'date', fsp: 3 }).notNull(),
  acceptedAt: datetime('accepted_at', { mode: 'date', fsp: 3 }),
  createdAt: createdAt(),
})

/**
 * rate-limiter-flexible's RateLimiterMySQL store for failed sign-ins, in our database.
 * The library writes rows positionally (`INSERT ... VALUES (key, points, expire)`), so the
 * columns and their order are exactly the ones it would create itself.
 */
export const signInLimits = mysqlTable('sign_in_limits', {
  key: varchar('key', { length: 255 }).primaryKey(),
  points: int('points').notNull().default(0),
  expire: bigint('expire', { mode: 'number', unsigned: true }),
})

/** A class an instructor teaches; students join by an e-mailed link or the join code. */
export const classes = mysqlTable('classes', {
  id: int('id').autoincrement().primaryKey(),
  instructorId: int('instructor_id').notNull().references(() => users.id, { onDelete: 'restrict' }),
  name: varchar('name', { length: 120 }).notNull(),
  term: varchar('term', { length: 60 }).notNull().default(''),
  // the lab-sheet tolerance, percent either side of the prediction
  tolerancePercent: decimal('tolerance_percent', { precision: 4, scale: 1, mode: 'number' }).notNull().default(5),
  joinCode: char('join_code', { length: 8 }).notNull().unique('classes_join_code_unique'),
  createdAt: createdAt(),
  updatedAt: updatedAt(),
}, table => [index('classes_instructor_idx').on(table.instructorId)])

export const classMembers = mysqlTable('class_members', {
  classId: int('class_id').notNull().references(() => classes.id, { onDelete: 'cascade' }),
  userId: int('user_id').notNull().references(() => users.id, { onDelete: 'cascade' }),
  joinedAt: createdAt(),
}, table => [primaryKey({ columns: [table.classId, table.userId] }), index('class_members_user_idx').on(table.userId)])

/** A student invitation to one class: the mailed token is kept as its SHA-256; single use, 14 days. */
export const classInvitations = mysqlTable('class_invitations', {
  id: int('id').autoincrement().primaryKey(),
  classId: int('class_id').notNull().references(() => classes.id, { onDelete: 'cascade' }),
  email: varchar('email', { length: 254 }).notNull(),
  tokenHash: char('token_hash', { length: 64 }).notNull().unique('class_invitations_token_unique'),
  expiresAt: datetime('expires_at', { mode: 'date', fsp: 3 }).notNull(),
  usedAt: datetime('used_at', { mode: 'date', fsp: 3 }),
  createdAt: createdAt(),
})


/**
 * A fault hunt: a copy of one of the author's banks (what students see) and, kept apart,
 * the hidden faults. `faults` never leaves the server for a student.
 */
export const hunts = mysqlTable('hunts', {
  id: int('id').autoincrement().primaryKey(),
  authorId: int('author_id').notNull().references(() => users.id, { onDelete: 'restrict' }),
  title: varchar('title', { length: 120 }).notNull(),
  instructions: text('instructions').notNull(),
  document: jsonDocument<Record<string, unknown>>('document').notNull(),
  faults: jsonDocument<Fault[]>('faults').notNull(),
  secondaryPrewired: boolean('secondary_prewired').notNull().default(true),
  dueAt: datetime('due_at', { mode: 'date', fsp: 3 }),
  probeBudget: int('probe_budget'),
  feedback: mysqlEnum('feedback', FEEDBACK).notNull().default('on-submit'),
  publishedAt: datetime('published_at', { mode: 'date', fsp: 3 }),
  deletedAt: datetime('deleted_at', { mode: 'date', fsp: 3 }),
  version: int('version').notNull().default(1),
  createdAt: createdAt(),
  updatedAt: updatedAt(),
}, table => [index('hunts_author_idx').on(table.authorId, table.deletedAt)])

/** Which classes a hunt is published to. */
export const huntClasses = mysqlTable('hunt_classes', {
  huntId: int('hunt_id').notNull().references(() => hunts.id, { onDelete: 'cascade' }),
  classId: int('class_id').notNull().references(() => classes.id, { onDelete: 'cascade' }),
  publishedAt: createdAt(),
}, table => [primaryKey({ columns: [table.huntId, table.classId] }), index('hunt_classes_class_idx').on(table.classId)])


/** One student's go at a hunt: their wiring as last sent, the counters, the diagnosis. */
export const attempts = mysqlTable('attempts', {
  id: int('id').autoincrement().primaryKey(),
  huntId: int('hunt_id').notNull().references(() => hunts.id, { onDelete: 'cascade' }),
  studentId: int('student_id').notNull().references(() => users.id, { onDelete: 'cascade' }),
  status: mysqlEnum('status', ATTEMPT_STATUSES).notNull().default('in-progress'),
  document: jsonDocument<Record<string, unknown>>('document').notNull(),
  probesUsed: int('probes_used').notNull().default(0),
  unsafeClosures: int('unsafe_closures').notNull().default(0),
  liveRewires: int('live_rewires').notNull().default(0),
  operations: int('operations').notNull().default(0),
  // the wiring last energized (a hash), null while the bank is dead
  liveWiring: char('live_wiring', { length: 64 }),
  diagnosis: jsonDocument<{ component: string, diagnosis: string }[]>('diagnosis'),
  correct: boolean('correct'),
  startedAt: createdAt(),
  lastActivityAt: datetime('last_activity_at', { mode: 'date', fsp: 3 }).notNull().default(sql`CURRENT_TIMESTAMP(3)`),
  submittedAt: datetime('submitted_at', { mode: 'date', fsp: 3 }),
}, table => [uniqueIndex('attempts_hunt_student_unique').on(table.huntId, table.studentId), index('attempts_student_idx').on(table.studentId)])

/** Every probe an attempt took, in order (the instructor's view of how it was found). */
export const attemptProbes = mysqlTable('attempt_probes', {
  id: int('id').autoincrement().primaryKey(),
  attemptId: int('attempt_id').notNull().references(() => attempts.id, { onDelete: 'cascade' }),
  fromTerminal: varchar('from_terminal', { length: 70 }).notNull(),
  toTerminal: varchar('to_terminal', { length: 70 }).notNull(),
  volts: decimal('volts', { precision: 14, scale: 4, mode: 'number' }).notNull(),
  degrees: decimal('degrees', { precision: 7, scale: 2, mode: 'number' }).notNull(),
  energized: boolean('energized').notNull(),
  takenAt: createdAt(),
}, table => [index('attempt_probes_attempt_idx').on(table.attemptId)])

/** rate-limiter-flexible's store for probes per attempt (same shape as sign_in_limits). */
export const probeLimits = mysqlTable('probe_limits', {
  key: varchar('key', { length: 255 }).primaryKey(),
  points: int('points').notNull().default(0),
  expire: bigint('expire', { mode: 'number', unsigned: true }),
})

export const LAB_SHEET_STATUSES = ['draft', 'submitted', 'accepted', 'redo'] as const

/**
 * A lab sheet: a snapshot of a bank (the prediction is computed from it), what the student
 * measured at each test point (by point id), the supply measured, notes, and the review.
 */
export const labSheets = mysqlTable('lab_sheets', {
  id: int('id').autoincrement().primaryKey(),
  ownerId: int('owner_id').notNull().references(() => users.id, { onDelete: 'cascade' }),
  title: varchar('title', { length: 120 }).notNull(),
  document: jsonDocument<Record<string, unknown>>('document').notNull(),
  measured: jsonDocument<Record<string, number | null>>('measured').notNull(),
  supplyVolts: decimal('supply_volts', { precision: 10, scale: 2, mode: 'number' }),
  rescale: boolean('rescale').notNull().default(false),
  notes: text('notes').notNull(),
  status: mysqlEnum('status', LAB_SHEET_STATUSES).notNull().default('draft'),
  classId: int('class_id').references(() => classes.id, { onDelete: 'set null' }),
  submittedAt: datetime('submitted_at', { mode: 'date', fsp: 3 }),
  reviewComment: text('review_comment'),
  reviewedAt: datetime('reviewed_at', { mode: 'date', fsp: 3 }),
  version: int('version').notNull().default(1),
  // the test points with their predictions, worked out when the sheet is made or its bank
  // changes, so that reading or listing a sheet solves nothing (null: not yet stored)
  points: jsonDocument<unknown[]>('points'),
  pointCount: int('point_count'),
  createdAt: createdAt(),
  updatedAt: updatedAt(),
}, table => [index('lab_sheets_owner_idx').on(table.ownerId), index('lab_sheets_class_idx').on(table.classId, table.status)])

/** A photo of the bench or the meter: re-encoded, metadata stripped, kept in the uploads storage. */
export const labSheetPhotos = mysqlTable('lab_sheet_photos', {
  id: int('id').autoincrement().primaryKey(),
  sheetId: int('sheet_id').notNull().references(() => labSheets.id, { onDelete: 'cascade' }),
  storageKey: varchar('storage_key', { length: 120 }).notNull(),
  thumbKey: varchar('thumb_key', { length: 120 }).notNull(),
  width: int('width').notNull(),
  height: int('height').notNull(),
  bytes: int('bytes').notNull(),
  caption: varchar('caption', { length: 200 }).notNull().default(''),
  createdAt: createdAt(),
}, table => [index('lab_sheet_photos_sheet_idx').on(table.sheetId)])

/**
 * A signed-in session, kept server-side so that it can be ended: the sealed cookie carries
 * only its id. Sign-out revokes one; "sign out everywhere", a password change or reset, a
 * role change and deactivation revoke all of a user's.
 */
export const sessions = mysqlTable('sessions', {
  id: char('id', { length: 43 }).primaryKey(),
  userId: int('user_id').notNull().references(() => users.id, { onDelete: 'cascade' }),
  createdAt: createdAt(),
  expiresAt: datetime('expires_at', { mode: 'date', fsp: 3 }).notNull(),
  revokedAt: datetime('revoked_at', { mode: 'date', fsp: 3 }),
}, table => [index('sessions_user_idx').on(table.userId)])

/**
 * Mail waiting to be sent: requests put their message here and a sender loop delivers it,
 * so no request's answer or timing depends on the mail service (or says who has an account).
 */
export const mailQueue = mysqlTable('mail_queue', {
  id: int('id').autoincrement().primaryKey(),
  message: jsonDocument<Record<string, unknown>>('message').notNull(),
  attempts: int('attempts').notNull().default(0),
  nextAttemptAt: datetime('next_attempt_at', { mode: 'date', fsp: 3 }).notNull().default(sql`CURRENT_TIMESTAMP(3)`),
  sentAt: datetime('sent_at', { mode: 'date', fsp: 3 }),
  lastError: text('last_error'),
  createdAt: createdAt(),
}, table => [index('mail_queue_due_idx').on(table.sentAt, table.nextAttemptAt)])

export type User = typeof users.$inferSelect
export type NewUser = typeof users.$inferInsert
export type Bank = typeof banks.$inferSelect
export type NewBank = typeof banks.$inferInsert
export type Invitation = typeof invitations.$inferSelect
export type Class = typeof classes.$inferSelect
export type Hunt = typeof hunts.$inferSelect
export type Attempt = typeof attempts.$inferSelect
export type LabSheet = typeof labSheets.$inferSelect
export type LabSheetPhoto = typeof labSheetPhotos.$inferSelect
