import { ref, watch } from 'vue'
import { ElMessage } from 'element-plus'
import { useRouter } from 'vue-router'
import type { ReleaseBlocker } from '@shared/recipes/completeness'
import type { ReleaseCheckDto } from '@shared/recipes/releaseCheck'
import type { ReleaseInput } from '@shared/schemas/recipes'
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
  const serverProblems = ref<ReleaseBlocker[] | null>(null)
  /** The server's answer for a complete draft, while the release confirmation is open. */
  const pendingRelease = ref<ReleaseCheckDto | null>(null)

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

  /**
   * Asks the server what is missing first; a complete draft gets the confirmation, which shows
   * what it changes and what becomes of the product's released revision.
   */
  const release = () =>
    busy(async () => {
      const check = await store.fetchReleaseCheck()
      if (check.blockers.length) {
        serverProblems.value = check.blockers
        const { letter } = store.revision!
        ElMessage.warning(`Revision ${letter} is not ready yet: see the list above the tabs.`)
        return
      }
      pendingRelease.value = check
    })

  /** Releases the draft once confirmed, saying what became of the one before. */
  const confirmRelease = (input: ReleaseInput) =>
    busy(async () => {
      const { letter } = store.revision!
      const replaced = pendingRelease.value?.released.map((r) => r.letter) ?? []
      try {
        await store.release(input)
        pendingRelease.value = null
        const after =
          replaced.length === 0
            ? ''
            : input.previous === 'obsolete'
              ? `; ${replaced.join(', ')} obsolete for new lots`
              : `; ${replaced.join(', ')} still released`
        ElMessage.success(`Revision ${letter} released${after}`)
      } catch (error) {
        // Someone changed the draft between the check and the release.
        if (error instanceof ApiError && error.code === 'revision_incomplete') {
          pendingRelease.value = null
          serverProblems.value = (await store.fetchReleaseCheck()).blockers
        }
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

  return { isBusy, serverProblems, pendingRelease, release, confirmRelease, obsolete, copy, remove }
}
