import { reactive, ref, watch } from 'vue'

/**
 * A dialog asked as a question: `await ask()` opens it and resolves with the answer, or with
 * null when it is closed any other way (Esc, the close button, a newer question).
 * Returned reactive, so a template binds `v-model="sign.isOpen"`.
 */
export function useAsk<T>() {
  const isOpen = ref(false)
  let settle: ((answer: T | null) => void) | null = null

  function finish(answer: T | null) {
    const resolve = settle
    settle = null
    isOpen.value = false
    resolve?.(answer)
  }

  function ask(): Promise<T | null> {
    finish(null)
    isOpen.value = true
    return new Promise<T | null>((resolve) => (settle = resolve))
  }

  watch(isOpen, (open) => {
    if (!open) finish(null)
  })

  return reactive({ isOpen, ask, answer: (value: T) => finish(value), cancel: () => finish(null) })
}
