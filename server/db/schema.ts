import { sql } from 'drizzle-orm'
import { bigint, boolean, char, datetime, index, int, mysqlEnum, mysqlTable, uniqueIndex, varchar } from 'drizzle-orm/mysql-core'
import { ROLES } from '../../shared/schemas/account'
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

export type User = typeof users.$inferSelect
export type NewUser = typeof users.$inferInsert
export type Bank = typeof banks.$inferSelect
export type NewBank = typeof banks.$inferInsert
export type Invitation = typeof invitations.$inferSelect
