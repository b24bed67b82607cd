import type {
  PinInput,
  UserAdminDto,
  UserCreateInput,
  UserUpdateInput,
} from '@shared/schemas/users'
import { downloadFile, json, request } from './client'

export const usersApi = {
  /** Admin only: every user, active or not. */
  list: () => request<UserAdminDto[]>('/users'),
  /** Admin only; 409 when the e-mail address is taken. */
  create: (input: UserCreateInput) => request<UserAdminDto>('/users', json('POST', input)),
  /** Admin only: rename, change role, (de)activate or set a new password. */
  update: (id: string, input: UserUpdateInput) =>
    request<UserAdminDto>(`/users/${encodeURIComponent(id)}`, json('PATCH', input)),
  /** Admin only: prints a person's badge (a new code; the card printed before stops signing). */
  printBadge: (id: string) =>
    downloadFile(`/users/${encodeURIComponent(id)}/badge`, { method: 'POST' }, 'badge.pdf'),
  /** The signed-in person's own badge. */
  printOwnBadge: () => downloadFile('/auth/badge', { method: 'POST' }, 'badge.pdf'),
  /** The signed-in person's bench PIN, their password re-typed. */
  setOwnPin: (input: PinInput) => request<{ pinSetAt: string }>('/auth/pin', json('PUT', input)),
}
