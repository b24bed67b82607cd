import { defineStore } from 'pinia'
import { usersApi } from '@/api/users'
import { useRecordList } from './lists/useRecordList'

export const useUsersStore = defineStore('users', () => {
  /** Every user, sorted by name; `isLoading` while they are fetched. */
  const {
    rows: users,
    isLoading,
    fetchAll,
    create,
    update,
  } = useRecordList(usersApi, (u) => u.name)

  return { users, isLoading, fetchAll, create, update }
})
