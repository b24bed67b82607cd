import { defineStore } from 'pinia'
import { computed, ref } from 'vue'
import { areasForRole } from '@shared/areas'
import type { LoginInput, UserDto } from '@shared/schemas/auth'
import { authApi } from '@/api/auth'
import { ApiError } from '@/api/client'

export const useSessionStore = defineStore('session', () => {
  /** The signed-in user, or null when signed out (or not yet known). */
  const user = ref<UserDto | null>(null)
  /** True once the server has told us who is signed in (or that nobody is). */
  const isKnown = ref(false)
  /** Role of the signed-in user, or null. */
  const role = computed(() => user.value?.role ?? null)
  /** Areas this user may open, in navigation order; empty when signed out. */
  const areas = computed(() => (user.value ? areasForRole(user.value.role) : []))

  /** Asks the server who is signed in; a 401 means nobody, anything else is rethrown. */
  async function load() {
    try {
      user.value = await authApi.me()
    } catch (error) {
      if (!(error instanceof ApiError && error.status === 401)) throw error
      user.value = null
    }
    isKnown.value = true
  }

  /** Signs in; throws ApiError 401 `invalid_credentials` or 429 `too_many_attempts`. */
  async function signIn(input: LoginInput) {
    user.value = await authApi.login(input)
    isKnown.value = true
  }

  /** Signs out locally even when the server is unreachable, so a shared bench is never left signed in. */
  async function signOut() {
    try {
      await authApi.logout()
    } finally {
      user.value = null
      isKnown.value = true
    }
  }

  return { user, isKnown, role, areas, load, signIn, signOut }
})
