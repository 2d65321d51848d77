import { sql } from 'drizzle-orm'
import { boolean, datetime, index, int, mysqlEnum, mysqlTable, varchar } from 'drizzle-orm/mysql-core'
import { jsonDocument } from './json-document'

export const roles = ['student', 'instructor', 'practitioner', 'admin'] as const
export type Role = (typeof roles)[number]

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
  createdAt: createdAt(),
  updatedAt: updatedAt(),
}, table => [
  index('banks_owner_idx').on(table.ownerId, table.deletedAt),
])

export type User = typeof users.$inferSelect
export type NewUser = typeof users.$inferInsert
export type Bank = typeof banks.$inferSelect
export type NewBank = typeof banks.$inferInsert
