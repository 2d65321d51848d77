/** Request bodies of the account routes; the forms validate with the same schemas as the server. */
import { z } from 'zod'

export const ROLES = ['student', 'instructor', 'practitioner', 'admin'] as const
export type Role = (typeof ROLES)[number]
/** Roles a person may choose at sign-up; instructors are made by an admin or an invitation. */
export const SELF_SERVICE_ROLES = ['student', 'practitioner'] as const

export const PASSWORD_MIN = 10

export const email = z
  .string({ error: 'e-mail is required' })
  .trim()
  .toLowerCase()
  .max(254, { error: 'e-mail is too long' })
  .pipe(z.email({ error: 'enter an e-mail address such as name@example.com' }))
const password = z
  .string({ error: 'password is required' })
  .min(PASSWORD_MIN, { error: `use at least ${PASSWORD_MIN} characters` })
  .max(200, { error: 'password is too long (200 characters at most)' })
const name = z.string({ error: 'name is required' }).trim().min(1, { error: 'enter your name' }).max(100, { error: 'name is too long (100 characters at most)' })

export const SignUpSchema = z.object({
  name,
  email,
  password,
  role: z.enum(SELF_SERVICE_ROLES, { error: 'choose student or practitioner' }),
  /** A page of this site to open once the mailed link is followed (carried in the link). */
  next: z.string().max(500).regex(/^\/(?![/\\])/, { error: 'not a page of this site' }).optional(),
})
export const SignInSchema = z.object({
  email,
  password: z.string({ error: 'password is required' }).min(1, { error: 'enter your password' }).max(200),
})
export const ForgotSchema = z.object({ email })
/** The token of a sign-up link; any string, so a wrong one gets the same 404 as a used one. */
export const ConfirmSignUpSchema = z.object({
  token: z.string({ error: 'the sign-up link is incomplete' }).min(1, { error: 'the sign-up link is incomplete' }).max(200),
})
export const ResetSchema = z.object({
  token: z.string({ error: 'the reset link is incomplete' }).min(20, { error: 'the reset link is incomplete' }).max(200),
  password,
})
export const AccountPatchSchema = z
  .object({
    name: name.optional(),
    currentPassword: z.string().max(200).optional(),
    newPassword: password.optional(),
  })
  .refine((b) => b.newPassword === undefined || (b.currentPassword?.length ?? 0) > 0, {
    error: 'enter your current password to change it',
    path: ['currentPassword'],
  })
  .refine((b) => b.name !== undefined || b.newPassword !== undefined, { error: 'nothing to change' })
export const InvitationSchema = z.object({ email, name: name.optional() })
export const AcceptInvitationSchema = z.object({ name: name.optional(), password: password.optional() })

export type SignUpBody = z.infer<typeof SignUpSchema>
export type SignInBody = z.infer<typeof SignInSchema>

/** What a signed-in session carries about its user, and nothing more. */
export interface SessionUser {
  id: number
  role: Role
  name: string
}

export const AdminUsersQuerySchema = z.object({
  q: z.string().trim().max(254).optional(),
  role: z.enum(ROLES, { error: `role must be one of ${ROLES.join(', ')}` }).optional(),
  page: z.coerce.number({ error: 'page must be a whole number' }).int().min(1).max(10_000).default(1),
  pageSize: z.coerce.number({ error: 'pageSize must be a whole number' }).int().min(1).max(100).default(20),
})
export const AdminUserPatchSchema = z
  .object({
    role: z.enum(ROLES, { error: `role must be one of ${ROLES.join(', ')}` }).optional(),
    active: z.boolean({ error: 'active must be true or false' }).optional(),
  })
  .refine((b) => b.role !== undefined || b.active !== undefined, { error: 'nothing to change: send role or active' })

/** One row of the admin users table. */
export interface AdminUserRow {
  id: number
  name: string
  email: string
  role: Role
  active: boolean
  createdAt: string
}

/** A message the development mail catcher captured (GET /api/admin/outbox). */
export interface OutboxMessage {
  id: string
  receivedAt: string
  from: string
  to: string[]
  subject: string
  text: string
  html: string
}
