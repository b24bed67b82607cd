import { defineStore } from 'pinia'
import { ref } from 'vue'
import type { UserAdminDto, UserCreateInput, UserUpdateInput } from '@shared/schemas/users'
import { usersApi } from '@/api/users'

export const useUsersStore = defineStore('users', () => {
  /** Every user, sorted by name. */
  const users = ref<UserAdminDto[]>([])
  /** True while the list is being fetched. */
  const isLoading = ref(false)

  function put(user: UserAdminDto) {
    const rest = users.value.filter((u) => u.id !== user.id)
    users.value = [...rest, user].sort((a, b) => a.name.localeCompare(b.name))
  }

  /** Fetches every user; throws ApiError. */
  async function fetchAll() {
    isLoading.value = true
    try {
      users.value = (await usersApi.list()).sort((a, b) => a.name.localeCompare(b.name))
    } finally {
      isLoading.value = false
    }
  }

  /** Creates a user with an initial password. */
  async function create(input: UserCreateInput) {
    const user = await usersApi.create(input)
    put(user)
    return user
  }

  /** Changes name, role, password or active flag. */
  async function update(id: string, input: UserUpdateInput) {
    const user = await usersApi.update(id, input)
    put(user)
    return user
  }

  return { users, isLoading, fetchAll, create, update }
})
