/** Request bodies of the class routes; the forms check with the same schemas. */
import { z } from 'zod'
import { email, type Role } from './account'
import { idParam, linkToken } from './ids'

/** The roles that belong to classes: who may join one, attempt its hunts and keep lab sheets. */
export const MEMBER_ROLES = ['student', 'instructor'] as const satisfies readonly Role[]
export const isMemberRole = (role: string | undefined | null): boolean => (MEMBER_ROLES as readonly string[]).includes(role ?? '')

const name = z.string({ error: 'name is required' }).trim().min(1, { error: 'give the class a name' }).max(120, { error: 'name is too long (120 characters at most)' })
const term = z.string({ error: 'term must be text' }).trim().max(60, { error: 'term is too long (60 characters at most)' })
const tolerancePercent = z.number({ error: 'tolerance must be a number of percent' })
  .gte(0.5, { error: 'tolerance is at least 0.5 %' })
  .lte(25, { error: 'tolerance is at most 25 %' })
  .refine(t => Math.round(t * 10) === t * 10, { error: 'tolerance takes one decimal at most' })

export const ClassCreateSchema = z.object({ name, term: term.default(''), tolerancePercent: tolerancePercent.default(5) })
export const ClassPatchSchema = z.object({ name: name.optional(), term: term.optional(), tolerancePercent: tolerancePercent.optional() })
  .refine(b => b.name !== undefined || b.term !== undefined || b.tolerancePercent !== undefined, { error: 'nothing to change: send name, term or tolerancePercent' })
export const ClassInviteSchema = z.object({
  emails: z.array(email, { error: 'emails is a list of e-mail addresses' }).min(1, { error: 'give at least one e-mail address' }).max(50, { error: 'at most 50 addresses at once' }),
})
export const JOIN_CODE_PATTERN = /^[A-HJ-NP-Z2-9]{8}$/
/** an invitation link's token, as the e-mail carries it */
const invitationToken = linkToken
export const ClassJoinSchema = z.object({
  code: z.string({ error: 'code must be text' }).trim().toUpperCase().regex(JOIN_CODE_PATTERN, { error: 'a join code is 8 letters and digits, as your instructor gave it' }).optional(),
  token: invitationToken.optional(),
}).refine(b => (b.code === undefined) !== (b.token === undefined), { error: 'send a join code or an invitation token (one of them)' })
/** POST /api/classes/invitation: what an invitation link is for, before it is used */
export const InvitationPreviewSchema = z.object({ token: invitationToken })
export const memberParams = z.object({
  id: idParam('id'),
  userId: idParam('userId'),
})

export interface ClassSummary {
  id: number
  name: string
  term: string
  tolerancePercent: number
  /** how the caller belongs to it */
  as: 'instructor' | 'member'
  instructor: string
  members: number
}
export interface RosterRow {
  userId: number
  name: string
  email: string
  joinedAt: string
  attempts: number
  lastActivityAt: string | null
}
