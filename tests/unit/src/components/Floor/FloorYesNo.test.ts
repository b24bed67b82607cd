import { mount } from '@vue/test-utils'
import { describe, expect, it } from 'vitest'
import FloorChoice from '@/components/Floor/FloorChoice.vue'
import FloorYesNo from '@/components/Floor/FloorYesNo.vue'

const yesNo = (modelValue: boolean | null) =>
  mount(FloorYesNo, {
    props: {
      modelValue,
      fieldId: 'check:tape',
      label: 'Tape fitted',
      isFail: false,
      isPass: false,
    },
  })

describe('FloorYesNo', () => {
  it('answers with Y and N', async () => {
    const wrapper = yesNo(null)
    await wrapper.trigger('keydown', { key: 'y' })
    await wrapper.trigger('keydown', { key: 'N' })
    expect(wrapper.emitted('update:modelValue')).toEqual([[true], [false]])
  })

  it('flips with Space, starting at yes', async () => {
    const unanswered = yesNo(null)
    await unanswered.trigger('keydown', { key: ' ' })
    expect(unanswered.emitted('update:modelValue')).toEqual([[true]])
    const yes = yesNo(true)
    await yes.trigger('keydown', { key: ' ' })
    expect(yes.emitted('update:modelValue')).toEqual([[false]])
  })

  it('moves on with Enter and is one tab stop', async () => {
    const wrapper = yesNo(true)
    await wrapper.trigger('keydown', { key: 'Enter' })
    expect(wrapper.emitted('next')).toHaveLength(1)
    expect(wrapper.attributes('tabindex')).toBe('0')
    expect(wrapper.get('[aria-checked="true"]').text()).toContain('Yes')
  })
})

describe('FloorChoice', () => {
  const options = [
    { value: 'no breakdown', isPass: true },
    { value: 'breakdown', isPass: false },
    { value: 'flashover', isPass: false },
  ]
  const choice = (modelValue: string | null) =>
    mount(FloorChoice, {
      props: {
        modelValue,
        options,
        fieldId: 'check:o',
        label: 'Outcome',
        isFail: false,
        isPass: false,
      },
    })

  it('picks an option by its number', async () => {
    const wrapper = choice(null)
    await wrapper.trigger('keydown', { key: '2' })
    await wrapper.trigger('keydown', { key: '9' })
    expect(wrapper.emitted('update:modelValue')).toEqual([['breakdown']])
  })

  it('steps through the options with the arrows, wrapping round', async () => {
    const last = choice('flashover')
    await last.trigger('keydown', { key: 'ArrowDown' })
    expect(last.emitted('update:modelValue')).toEqual([['no breakdown']])
    const first = choice('no breakdown')
    await first.trigger('keydown', { key: 'ArrowUp' })
    expect(first.emitted('update:modelValue')).toEqual([['flashover']])
  })
})
