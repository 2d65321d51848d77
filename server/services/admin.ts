/** What admins do: find people, change their role or switch them off, invite instructors. */
import { and, count, desc, eq, like, or } from 'drizzle-orm'
import type { z } from 'zod'
import type { AdminUserRow, AdminUsersQuerySchema, Role } from '#shared/schemas/account'
import type { Paged } from '#shared/schemas/banks'
import type { User } from '../db/schema'
import { instructorInvitationMail } from './mail-messages'
import { userById } from './accounts'

const { users } = tables
const INVITATION_DAYS = 7

function row(user: User): AdminUserRow {
  return { id: user.id, name: user.name, email: user.email, role: user.role, active: user.active, createdAt: user.createdAt.toISOString() }
}

export async function listUsers(query: z.output<typeof AdminUsersQuerySchema>): Promise<Paged<AdminUserRow>> {
  const pattern = query.q ? `%${query.q.replace(/[\\%_]/g, c => `\\${c}`)}%` : undefined
  const where = and(
    pattern ? or(like(users.name, pattern), like(users.email, pattern)) : undefined,
    query.role ? eq(users.role, query.role) : undefined,
  )
  const db = useDB()
  const [rows, [total]] = await Promise.all([
    db.select().from(users).where(where).orderBy(desc(users.createdAt), desc(users.id))
      .limit(query.pageSize).offset((query.page - 1) * query.pageSize),
    db.select({ n: count() }).from(users).where(where),
  ])
  return { items: rows.map(row), total: Number(total?.n ?? 0), page: query.page, pageSize: query.pageSize }
}

/** Changes a user's role and/or active flag; either change signs them out everywhere. */
export async function changeUser(admin: User, id: number, change: { role?: Role, active?: boolean }): Promise<AdminUserRow> {
  const target = await userById(id)
  if (target.id === admin.id) {
    throw invalidInput([{ path: change.role !== undefined ? 'role' : 'active', message: 'you cannot change your own role or switch yourself off: ask another admin' }], 'Not on yourself')
  }
  const set: Record<string, unknown> = {}
  if (change.role !== undefined) set.role = change.role
  if (change.active !== undefined) set.active = change.active
  await useDB().transaction(async (tx) => {
    await tx.update(users).set(set).where(eq(users.id, id))
    await revokeAllSessions(id, tx)
  })
  return row(await userById(id))
}

/** Records an instructor invitation and mails its link. */
export async function inviteInstructor(admin: User, email: string, name: string | undefined) {
  const token = newLinkToken()
  const expiresAt = new Date(Date.now() + INVITATION_DAYS * 86400_000)
  const created = await useDB().transaction(async (tx) => {
    const [row] = await tx.insert(tables.invitations)
      .values({ email, name: name ?? null, tokenHash: hashLinkToken(token), invitedBy: admin.id, expiresAt })
      .$returningId()
    await queueMail(instructorInvitationMail(email, name ?? null, admin.name, publicUrl(`/invitations/${token}`)), tx)
    return row
  })
  return { id: created!.id, email, expiresAt: expiresAt.toISOString() }
}
