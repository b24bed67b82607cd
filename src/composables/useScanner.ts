import { onScopeDispose, ref } from 'vue'

export interface ScannerOptions {
  /** Longest pause between two characters of one scan, in ms; a person types slower. */
  maxGapMs?: number
  /** Fewest characters a scan has; shorter bursts are left to the focused control. */
  minLength?: number
  /** Where to listen; the window unless a test passes its own target. */
  target?: Pick<Window, 'addEventListener' | 'removeEventListener'>
  /** Clock in ms; tests pass their own. */
  now?: () => number
}

/** Text fields take a scan themselves, as typing followed by Enter. */
function isTextField(target: EventTarget | null): boolean {
  if (!(target instanceof HTMLElement)) return false
  if (target.isContentEditable || target instanceof HTMLTextAreaElement) return true
  return (
    target instanceof HTMLInputElement &&
    !['checkbox', 'radio', 'button', 'submit'].includes(target.type)
  )
}

/**
 * Collects what a keyboard-wedge scanner types while the focus is on something other than a
 * text field (a yes/no control, a button, the page) and hands the text over on Enter, so a
 * scan is never lost or taken as key presses. A scan is a fast burst: every character within
 * `maxGapMs` of the one before. From the second character of a burst on, keys are kept from
 * the focused control, so a scanned "Y" or digit does not answer a check.
 * @param onCode receives the raw text as typed; pass it through `codeFromScan`
 */
export function useScanner(onCode: (text: string) => void, options: ScannerOptions = {}) {
  const maxGapMs = options.maxGapMs ?? 50
  const minLength = options.minLength ?? 4
  const now = options.now ?? (() => performance.now())
  const target = options.target ?? window
  /** The last text handed over, for display and tests. */
  const lastCode = ref<string | null>(null)
  let buffer = ''
  let lastAt = Number.NEGATIVE_INFINITY

  function onKeydown(event: Event) {
    const key = event as KeyboardEvent
    if (isTextField(key.target)) {
      buffer = ''
      return
    }
    const at = now()
    const isQuick = at - lastAt <= maxGapMs
    lastAt = at
    if (key.key === 'Enter') {
      const text = buffer
      buffer = ''
      if (text.length >= minLength && isQuick) {
        key.preventDefault()
        key.stopImmediatePropagation()
        lastCode.value = text
        onCode(text)
      }
      return
    }
    if (key.key.length !== 1 || key.ctrlKey || key.metaKey || key.altKey) {
      buffer = ''
      return
    }
    if (!isQuick) buffer = ''
    if (buffer.length > 0) {
      key.preventDefault()
      key.stopImmediatePropagation()
    }
    buffer += key.key
  }

  target.addEventListener('keydown', onKeydown, true)
  onScopeDispose(() => target.removeEventListener('keydown', onKeydown, true))
  return { lastCode }
}
