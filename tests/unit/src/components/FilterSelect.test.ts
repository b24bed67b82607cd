import { flushPromises, mount } from '@vue/test-utils'
import { ElOption, ElSelect } from 'element-plus'
import { describe, expect, it } from 'vitest'
import FilterSelect from '@/components/FilterSelect.vue'

const KINDS = ['winding', 'hipot'] as const
const LABELS: Record<string, string> = { winding: 'Winding', hipot: 'Hipot' }

describe('FilterSelect', () => {
  it('offers one option per value, labelled by the label function', async () => {
    const wrapper = mount(FilterSelect, {
      props: { modelValue: '', options: KINDS, label: (k: string) => LABELS[k] },
    })
    await flushPromises()
    const options = wrapper.findAllComponents(ElOption)
    expect(options.map((o) => [o.props('value'), o.props('label')])).toEqual([
      ['winding', 'Winding'],
      ['hipot', 'Hipot'],
    ])
    wrapper.unmount()
  })

  it('shows the value itself without a label function, and clears to the empty string', () => {
    const wrapper = mount(FilterSelect, {
      props: { modelValue: 'Lot', options: ['Unit', 'Lot'], placeholder: 'Any entity' },
    })
    const select = wrapper.findComponent(ElSelect)
    expect(select.props('clearable')).toBe(true)
    expect(select.props('valueOnClear')).toBe('')
    expect(select.props('placeholder')).toBe('Any entity')
    expect(wrapper.findAllComponents(ElOption).map((o) => o.props('label'))).toEqual([
      'Unit',
      'Lot',
    ])
    select.vm.$emit('update:modelValue', '')
    expect(wrapper.emitted('update:modelValue')).toEqual([['']])
    wrapper.unmount()
  })
})
