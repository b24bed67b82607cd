import { mount } from '@vue/test-utils'
import { describe, expect, it } from 'vitest'
import { codeFromScan } from '@shared/links'
import FloorScanBox from '@/components/Floor/FloorScanBox.vue'

describe('FloorScanBox', () => {
  it('hands over a scanned traveler URL on Enter, and the serial comes out of it', async () => {
    const wrapper = mount(FloorScanBox, { props: { isBusy: false } })
    const input = wrapper.get('input')
    // What a keyboard-wedge scanner types for a traveler's QR, before its Enter.
    await input.setValue('https://waymark.example/u/FP24-2649-00017K')
    await wrapper.get('form').trigger('submit')

    const [[scanned]] = wrapper.emitted('scan') as [[string]]
    expect(codeFromScan(scanned)).toBe('FP24-2649-00017K')
    // The box is empty again, ready for the next unit.
    expect((input.element as HTMLInputElement).value).toBe('')
  })

  it('takes a bare serial typed by hand as it is', async () => {
    const wrapper = mount(FloorScanBox, { props: { isBusy: false } })
    await wrapper.get('input').setValue(' fp24-2649-00017k ')
    await wrapper.get('form').trigger('submit')
    const [[scanned]] = wrapper.emitted('scan') as [[string]]
    expect(codeFromScan(scanned)).toBe('FP24-2649-00017K')
  })

  it('ignores an empty Enter', async () => {
    const wrapper = mount(FloorScanBox, { props: { isBusy: false } })
    await wrapper.get('form').trigger('submit')
    expect(wrapper.emitted('scan')).toBeUndefined()
  })

  it('asks for the camera', async () => {
    const wrapper = mount(FloorScanBox, { props: { isBusy: false } })
    await wrapper.get('button').trigger('click')
    expect(wrapper.emitted('camera')).toHaveLength(1)
  })
})
