import { mount } from '@vue/test-utils'
import { describe, expect, it } from 'vitest'
import StationKindTag from '@/components/StationKindTag.vue'

describe('StationKindTag', () => {
  it('shows the label of the kind, not its key', () => {
    const wrapper = mount(StationKindTag, { props: { kind: 'load_test' } })
    expect(wrapper.text()).toContain('Load test')
    expect(wrapper.text()).not.toContain('load_test')
  })

  it('carries a class per kind for its colour', () => {
    const wrapper = mount(StationKindTag, { props: { kind: 'winding' } })
    expect(wrapper.classes()).toContain('kind-tag--winding')
  })

  it('marks high-voltage kinds', () => {
    expect(
      mount(StationKindTag, { props: { kind: 'hipot' } })
        .find('abbr')
        .text(),
    ).toBe('HV')
    expect(
      mount(StationKindTag, { props: { kind: 'soldering' } })
        .find('abbr')
        .exists(),
    ).toBe(false)
  })
})
