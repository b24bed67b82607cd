import { ref, watch } from 'vue'
import { ElMessage } from 'element-plus'
import { useRouter } from 'vue-router'
import { ApiError, messageOf } from '@/api/client'
import { useRevisionStore } from '@/stores/revision'
import { confirmAction } from './confirmAction'

/** Release, retire, copy and delete of the open revision, each confirmed first. */
export function useRevisionLifecycle() {
  const store = useRevisionStore()
  const router = useRouter()
  /** True while one of these actions runs. */
  const isBusy = ref(false)
  /** The server's list of what stops the release, from the last attempt; null once anything changed. */
  const serverProblems = ref<string[] | null>(null)

  watch(
    () => store.revision,
    () => (serverProblems.value = null),
    { deep: true },
  )

  async function busy(action: () => Promise<void>) {
    isBusy.value = true
    try {
      await action()
    } catch (error) {
      ElMessage.error(messageOf(error))
    } finally {
      isBusy.value = false
    }
  }

  /** Asks the server what is missing first; only a complete draft gets the confirmation. */
  const release = () =>
    busy(async () => {
      const { letter, productCode } = store.revision!
      const problems = await store.fetchReleaseProblems()
      if (problems.length) {
        serverProblems.value = problems
        ElMessage.warning(`Revision ${letter} is not ready yet: see the list above the tabs.`)
        return
      }
      const message = `Release revision ${letter} of ${productCode}? Lots can then be built to it, and it is frozen: any later change needs a new revision.`
      if (!(await confirmAction(message, 'Release revision', `Release ${letter}`, false))) return
      try {
        await store.release()
        ElMessage.success(`Revision ${letter} released`)
      } catch (error) {
        // Someone changed the draft between the check and the release.
        if (error instanceof ApiError && error.code === 'revision_incomplete')
          serverProblems.value = await store.fetchReleaseProblems()
        throw error
      }
    })

  const obsolete = () =>
    busy(async () => {
      const { letter } = store.revision!
      const message = `Mark revision ${letter} obsolete? No new lots can be built to it; units already built keep it in their history.`
      if (!(await confirmAction(message, 'Mark obsolete', 'Mark obsolete'))) return
      await store.obsolete()
      ElMessage.success(`Revision ${letter} is obsolete`)
    })

  const copy = () =>
    busy(async () => {
      const from = store.revision!.letter
      const draft = await store.copy()
      ElMessage.success(`Draft ${draft.letter} made from revision ${from}`)
      await router.push(`/recipes/revisions/${draft.id}`)
    })

  const remove = () =>
    busy(async () => {
      const { letter, productCode } = store.revision!
      if (
        !(await confirmAction(
          `Delete draft ${letter} of ${productCode} with its route, checks and bill of materials?`,
          'Delete draft',
          'Delete draft',
        ))
      )
        return
      await store.remove()
      ElMessage.success(`Draft ${letter} deleted`)
      await router.push('/recipes')
    })

  return { isBusy, serverProblems, release, obsolete, copy, remove }
}
