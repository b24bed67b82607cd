import { defineStore } from 'pinia'
import { usersApi } from '@/api/users'
import { useRecordList } from './lists/useRecordList'

export const useUsersStore = defineStore('users', () => {
  /** Every user, sorted by name, with the list's flag and calls (`isLoading`, `fetchAll`, …). */
  const { rows: users, ...list } = useRecordList(usersApi, (u) => u.name)

  return { users, ...list }
})
