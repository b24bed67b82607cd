import { mount } from '@vue/test-utils'
import { describe, expect, it } from 'vitest'
import FloorMaterialRow from '@/components/Floor/FloorMaterialRow.vue'
import type { MaterialEntry } from '@/composables/useFloorForm'
import { bomLine } from './fixtures'

const entry = (overrides: Partial<MaterialEntry> = {}): MaterialEntry => ({
  line: bomLine(),
  scanned: 'CL-26-00002C',
  itemSerial: '',
  status: 'checking',
  lot: null,
  message: '',
  ...overrides,
})

describe('FloorMaterialRow', () => {
  it('selects a refused lot’s text, so the next scan replaces it instead of appending', async () => {
    const wrapper = mount(FloorMaterialRow, {
      props: { entry: entry(), errors: {} },
      attachTo: document.body,
    })
    const input = wrapper.get<HTMLInputElement>('input').element
    input.focus()
    input.setSelectionRange(input.value.length, input.value.length)
    await wrapper.setProps({ entry: entry({ status: 'refused', message: 'quarantined' }) })
    expect(document.activeElement).toBe(input)
    expect([input.selectionStart, input.selectionEnd]).toEqual([0, input.value.length])
    wrapper.unmount()
  })

  it('does not pull focus from another field the operator has started to fill', async () => {
    const other = document.createElement('input')
    document.body.append(other)
    const wrapper = mount(FloorMaterialRow, {
      props: { entry: entry(), errors: {} },
      attachTo: document.body,
    })
    other.focus()
    other.value = '108'
    await wrapper.setProps({ entry: entry({ status: 'refused', message: 'quarantined' }) })
    expect(document.activeElement).toBe(other)
    wrapper.unmount()
    other.remove()
  })
})
