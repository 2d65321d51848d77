import type { z } from 'zod'
import { formatPath } from '#shared/circuit/parse'

interface ServerFieldError { path: string, message: string }

/** The body of an error our API answered with ($fetch's FetchError.data). */
export function apiErrorOf(error: unknown): { status: number, message: string, errors: ServerFieldError[], data: Record<string, unknown> } {
  const e = error as { statusCode?: number, status?: number, data?: { statusMessage?: string, message?: string, data?: { errors?: ServerFieldError[] } & Record<string, unknown> } }
  const status = e?.statusCode ?? e?.status ?? 0
  const body = e?.data
  return {
    status,
    message: body?.statusMessage || body?.message || (status ? `The server answered ${status}` : 'The server could not be reached: check the connection and try again'),
    errors: body?.data?.errors ?? [],
    data: body?.data ?? {},
  }
}

/** The answer's message with the field errors after it, in one line: "Invalid body: the bank has no T9". */
export function apiErrorText(error: unknown): string {
  const { message, errors } = apiErrorOf(error)
  return [message, errors.map(e => e.message).join('; ')].filter(Boolean).join(': ')
}

/**
 * A form checked with a shared zod schema as the user types: a field shows its error once it
 * has been typed in (or after a submit). What was typed stays after a server error, and the
 * server's own field errors show beside their fields until the field is changed.
 */
export function useForm<S extends z.ZodType<Record<string, unknown>>>(schema: S, initial: Record<string, unknown>) {
  const values = reactive({ ...initial }) as Record<string, any>
  const touched = reactive<Record<string, boolean>>({})
  const serverErrors = ref<Record<string, string>>({})
  const submitted = ref(false)
  const pending = ref(false)
  const message = ref('')

  const checked = computed(() => schema.safeParse(values))
  const clientErrors = computed(() => {
    const found: Record<string, string> = {}
    if (checked.value.success) return found
    for (const issue of checked.value.error.issues) {
      const path = formatPath(issue.path)
      found[path] ??= issue.message
    }
    return found
  })
  const errors = computed(() => {
    const shown: Record<string, string> = {}
    for (const [path, text] of Object.entries(serverErrors.value)) shown[path] = text
    for (const [path, text] of Object.entries(clientErrors.value)) {
      if (submitted.value || touched[path]) shown[path] = text
    }
    return shown
  })

  /** Marks a field as typed in, and forgets the server's error about it. */
  function input(path: string) {
    touched[path] = true
    if (serverErrors.value[path]) {
      const { [path]: _gone, ...rest } = serverErrors.value
      serverErrors.value = rest
    }
  }

  /** Runs `action` with the parsed values if they are valid; maps a server error back onto the form. */
  async function submit(action: (data: z.output<S>) => Promise<unknown>): Promise<boolean> {
    submitted.value = true
    message.value = ''
    if (!checked.value.success) {
      message.value = 'Check the fields marked below.'
      return false
    }
    pending.value = true
    try {
      await action(checked.value.data)
      serverErrors.value = {}
      return true
    }
    catch (error) {
      const answer = apiErrorOf(error)
      const byPath: Record<string, string> = {}
      for (const e of answer.errors) byPath[e.path] ??= e.message
      serverErrors.value = byPath
      message.value = answer.message
      return false
    }
    finally {
      pending.value = false
    }
  }

  return { values, errors, touched, serverErrors, message, pending, submitted, input, submit }
}
