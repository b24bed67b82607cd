import { mount } from '@vue/test-utils'
import { ElDatePicker } from 'element-plus'
import { describe, expect, it } from 'vitest'
import DayPicker from '@/components/DayPicker.vue'

describe('DayPicker', () => {
  it('is a date picker that reads and writes YYYY-MM-DD, and passes other attributes on', () => {
    const wrapper = mount(DayPicker, {
      props: { modelValue: '2026-03-01' },
      attrs: { format: 'DD MMM YYYY', placeholder: 'none' },
    })
    const picker = wrapper.findComponent(ElDatePicker)
    expect(picker.props('type')).toBe('date')
    expect(picker.props('valueFormat')).toBe('YYYY-MM-DD')
    expect(picker.props('format')).toBe('DD MMM YYYY')
    expect((wrapper.get('input').element as HTMLInputElement).value).toBe('01 Mar 2026')
    picker.vm.$emit('update:modelValue', '2026-03-02')
    expect(wrapper.emitted('update:modelValue')).toEqual([['2026-03-02']])
    wrapper.unmount()
  })
})
