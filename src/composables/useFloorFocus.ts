import { onMounted, onScopeDispose } from 'vue'
import type { Ref } from 'vue'

/** Dialogs, message boxes and dropdowns are teleported out of the station screen. */
const OVERLAYS = '.el-overlay, .el-overlay-message-box, .el-message-box, .el-popper'

/**
 * Keeps the cursor in the scan box whenever the operator is not working in another control of
 * the station screen: after a click on empty space, after Tab leaves the screen, when the
 * window or tab comes back, so a hand scanner's next burst always lands somewhere useful.
 * @param root the station screen
 * @param focusScan puts the cursor in the scan box
 * @param isPaused true while a dialog of the screen is open
 */
export function useFloorFocus(
  root: Ref<HTMLElement | undefined>,
  focusScan: () => void,
  isPaused: () => boolean,
) {
  let timer: ReturnType<typeof setTimeout> | undefined

  function settle() {
    if (isPaused() || document.visibilityState === 'hidden') return
    const active = document.activeElement
    if (active && active !== document.body && root.value?.contains(active)) return
    if (active?.closest(OVERLAYS)) return
    focusScan()
  }

  /** Focus moves in steps (out of one element, into the next); look once it has landed. */
  function later() {
    clearTimeout(timer)
    timer = setTimeout(settle, 0)
  }

  onMounted(() => {
    document.addEventListener('focusout', later)
    window.addEventListener('focus', later)
    document.addEventListener('visibilitychange', later)
    later()
  })
  onScopeDispose(() => {
    clearTimeout(timer)
    document.removeEventListener('focusout', later)
    window.removeEventListener('focus', later)
    document.removeEventListener('visibilitychange', later)
  })

  return { settle: later }
}
