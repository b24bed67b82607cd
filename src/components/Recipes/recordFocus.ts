import { nextTick } from 'vue'
import type { ReleaseBlocker } from '@shared/recipes/completeness'

/** Where a release blocker or a change points: a check's row, a step's card or a part's line. */
export interface RecordTarget {
  stepId: string | null
  checkId: string | null
  bomLineId: string | null
}

/** The revision page's tab that shows the record. */
export const tabOf = (target: RecordTarget) => (target.bomLineId ? 'bom' : 'route')

function selectorOf(target: RecordTarget): string | null {
  if (target.checkId) return `[data-check-id="${target.checkId}"]`
  if (target.stepId) return `[data-step-id="${target.stepId}"]`
  if (target.bomLineId) return `.bom-line-${target.bomLineId}`
  return null
}

/**
 * Scrolls the record into the middle of the screen and flashes it, once the tab that holds it
 * is shown. It stays marked `data-pointed` for the flash, so a browser test can see where it went.
 * @returns false when the record is not on the page (deleted meanwhile)
 */
export async function pointAt(target: RecordTarget | ReleaseBlocker): Promise<boolean> {
  await nextTick()
  const selector = selectorOf(target)
  const element = selector ? document.querySelector<HTMLElement>(selector) : null
  if (!element) return false
  element.scrollIntoView({ block: 'center', behavior: 'smooth' })
  element.dataset.pointed = 'true'
  const flash = element.animate(
    [
      {
        boxShadow: 'inset 0 0 0 3px var(--el-color-warning)',
        background: 'var(--el-color-warning-light-8)',
      },
      {},
    ],
    { duration: 2600, easing: 'ease-out' },
  )
  flash.onfinish = () => delete element.dataset.pointed
  if (element.tabIndex >= 0) element.focus({ preventScroll: true })
  return true
}
