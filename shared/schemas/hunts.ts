/** Request bodies of the fault-hunt and attempt routes; the forms check with the same schemas. */
import { z } from 'zod'
import { CircuitSchema } from '../circuit/parse'
import { DIAGNOSES, FaultListSchema } from '../hunts/faults'
import { idField } from './ids'

export const FEEDBACK = ['on-submit', 'after-due'] as const
export type FeedbackMode = (typeof FEEDBACK)[number]
/** An attempt as stored; the student's lists add 'not-started' for a hunt with none yet. */
export const ATTEMPT_STATUSES = ['in-progress', 'submitted'] as const
export type AttemptStatus = (typeof ATTEMPT_STATUSES)[number] | 'not-started'

const title = z.string({ error: 'title is required' }).trim().min(1, { error: 'give the hunt a title' }).max(120, { error: 'title is too long (120 characters at most)' })
const instructions = z.string({ error: 'instructions must be text' }).trim().max(4000, { error: 'instructions are too long (4000 characters at most)' })
const dueAt = z.iso.datetime({ offset: true, error: 'dueAt must be a date and time such as 2027-01-15T17:00:00Z' }).nullable()
const probeBudget = z.number({ error: 'probeBudget must be a whole number' }).int({ error: 'probeBudget must be a whole number' }).min(1, { error: 'allow at least one probe' }).max(1000, { error: 'probeBudget is at most 1000' }).nullable()
const id = idField('id', 'must be an id')

const settings = {
  title,
  instructions: instructions.default(''),
  secondaryPrewired: z.boolean({ error: 'secondaryPrewired is true or false' }).default(true),
  dueAt: dueAt.default(null),
  probeBudget: probeBudget.default(null),
  feedback: z.enum(FEEDBACK, { error: `feedback is ${FEEDBACK.join(' or ')}` }).default('on-submit'),
}
const needsDue = (b: { feedback?: FeedbackMode, dueAt?: string | null }) => b.feedback !== 'after-due' || !!b.dueAt

export const HuntCreateSchema = z.object({ bankId: id, ...settings, faults: FaultListSchema.min(1, { error: 'hide at least one fault' }) })
  .refine(needsDue, { error: 'feedback after the due date needs a due date', path: ['dueAt'] })
export const HuntPatchSchema = z.object({
  title: title.optional(),
  instructions: instructions.optional(),
  secondaryPrewired: z.boolean({ error: 'secondaryPrewired is true or false' }).optional(),
  dueAt: dueAt.optional(),
  probeBudget: probeBudget.optional(),
  feedback: z.enum(FEEDBACK, { error: `feedback is ${FEEDBACK.join(' or ')}` }).optional(),
  faults: FaultListSchema.min(1, { error: 'hide at least one fault' }).optional(),
}).refine(b => Object.values(b).some(v => v !== undefined), { error: 'nothing to change' })
export const HuntPublishSchema = z.object({
  classIds: z.array(id, { error: 'classIds is a list of class ids' }).min(1, { error: 'choose at least one class' }).max(50, { error: 'at most 50 classes' }),
})

const terminal = z.string({ error: 'name a terminal such as "T1.X1"' }).min(3, { error: 'name a terminal such as "T1.X1"' }).max(70, { error: 'terminal name is too long' })
export const ProbeSchema = z.object({ document: CircuitSchema, from: terminal, to: terminal })
  .refine(b => b.from !== b.to, { error: 'probe two different terminals', path: ['to'] })
export const EnergizeSchema = z.object({ document: CircuitSchema })
export const SubmitSchema = z.object({
  document: CircuitSchema.optional(),
  diagnosis: z.array(z.object({
    component: z.string({ error: 'name the unit or supply' }).min(1, { error: 'name the unit or supply' }).max(32, { error: 'component id is too long' }),
    diagnosis: z.enum(DIAGNOSES, { error: `diagnosis is one of ${DIAGNOSES.join(', ')}` }),
  }), { error: 'diagnosis is a list of { component, diagnosis }' }).min(1, { error: 'name at least one fault' }).max(6, { error: 'at most six findings' }),
})
