import type { ClassSummary } from '#shared/schemas/classes'

/**
 * The classes the signed-in user teaches or belongs to (`GET /api/classes`), under one cache
 * key wherever a page or component needs them. `immediate: false` for a role with no classes.
 */
export function useClasses(options: { immediate?: boolean } = {}) {
  return useFetch<ClassSummary[]>('/api/classes', { key: 'classes', default: () => [], immediate: options.immediate ?? true })
}
