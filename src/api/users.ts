import type { UserAdminDto, UserCreateInput, UserUpdateInput } from '@shared/schemas/users'
import { json, request } from './client'

export const usersApi = {
  /** Admin only: every user, active or not. */
  list: () => request<UserAdminDto[]>('/users'),
  /** Admin only; 409 when the e-mail address is taken. */
  create: (input: UserCreateInput) => request<UserAdminDto>('/users', json('POST', input)),
  /** Admin only: rename, change role, (de)activate or set a new password. */
  update: (id: string, input: UserUpdateInput) =>
    request<UserAdminDto>(`/users/${encodeURIComponent(id)}`, json('PATCH', input)),
}
