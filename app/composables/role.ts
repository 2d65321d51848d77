import { isMemberRole } from '#shared/schemas/classes'

/** The signed-in user's role ('' signed out) and whether it belongs to classes (student or instructor). */
export function useRole() {
  const { user } = useUserSession()
  const role = computed(() => user.value?.role ?? '')
  const member = computed(() => isMemberRole(role.value))
  return { role, member }
}
