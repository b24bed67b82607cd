import type { LoginInput, UserDto } from '@shared/schemas/auth'
import { forgetCsrfToken, json, request } from './client'

export const authApi = {
  /** The signed-in user; throws ApiError 401 when signed out. */
  me: () => request<{ user: UserDto }>('/auth/me').then((body) => body.user),
  /** Signs in; the session is regenerated, so the old CSRF token is dropped. */
  login: async (input: LoginInput) => {
    const { user } = await request<{ user: UserDto }>('/auth/login', json('POST', input))
    forgetCsrfToken()
    return user
  },
  /** Signs out; the CSRF token is dropped even when the server call fails. */
  logout: () => request<void>('/auth/logout', json('POST')).finally(forgetCsrfToken),
}
