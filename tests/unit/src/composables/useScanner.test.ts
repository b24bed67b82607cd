import { effectScope } from 'vue'
import { describe, expect, it, vi } from 'vitest'
import { useScanner } from '@/composables/useScanner'

/** Sends keys at chosen times to a listener target, as a scanner (fast) or a person (slow). */
function setUp() {
  let clock = 0
  const target = new EventTarget()
  const onCode = vi.fn()
  const scope = effectScope()
  scope.run(() => useScanner(onCode, { target: target as unknown as Window, now: () => clock }))
  const press = (key: string, at: number, on: EventTarget = document.body) => {
    clock = at
    const event = new KeyboardEvent('keydown', { key, cancelable: true, bubbles: true })
    Object.defineProperty(event, 'target', { value: on })
    target.dispatchEvent(event)
    return event
  }
  const burst = (text: string, start: number, gap: number, on?: EventTarget) => {
    let at = start
    for (const ch of text) press(ch, (at += gap), on)
    return press('Enter', at + gap, on)
  }
  return { onCode, press, burst, scope }
}

describe('useScanner', () => {
  it('hands over a fast burst that ends in Enter', () => {
    const { onCode, burst } = setUp()
    const enter = burst('https://w.example/u/FP24-2649-00017K', 0, 8)
    expect(onCode).toHaveBeenCalledWith('https://w.example/u/FP24-2649-00017K')
    // The Enter of a scan does not also press the focused button.
    expect(enter.defaultPrevented).toBe(true)
  })

  it('leaves a person’s slow typing to the focused control', () => {
    const { onCode, burst } = setUp()
    const enter = burst('yes', 0, 180)
    expect(onCode).not.toHaveBeenCalled()
    expect(enter.defaultPrevented).toBe(false)
  })

  it('keeps the characters of a burst from the focused control after the first', () => {
    const { press } = setUp()
    expect(press('F', 0).defaultPrevented).toBe(false)
    expect(press('P', 6).defaultPrevented).toBe(true)
  })

  it('ignores keys typed into text fields, which take scans themselves', () => {
    const { onCode, burst } = setUp()
    const input = document.createElement('input')
    burst('FP24-2649-00017K', 0, 5, input)
    expect(onCode).not.toHaveBeenCalled()
  })

  it('stops listening when its scope ends', () => {
    const { onCode, burst, scope } = setUp()
    scope.stop()
    burst('FP24-2649-00017K', 0, 5)
    expect(onCode).not.toHaveBeenCalled()
  })
})
