import { mount } from '@vue/test-utils'
import { describe, expect, it } from 'vitest'
import type { StepDto } from '@shared/schemas/recipes'
import { HIGH_VOLTAGE_CAUTION } from '@shared/safety/hipot'
import RouteEditor from '@/components/Recipes/RouteEditor.vue'

const step = (id: string, position: number, stationKind: StepDto['stationKind']): StepDto => ({
  id,
  position,
  name: `Step ${id}`,
  stationKind,
  instructions: 'First line\nSecond line',
  safetyNote: '',
  requiresSignoff: false,
  checks: [],
})
/** happy-dom's DataTransfer has no setDragImage; the editor only needs these members. */
const fakeTransfer = () => ({
  effectAllowed: 'all',
  setData: () => undefined,
  setDragImage: () => undefined,
})
const steps = [step('a', 1, 'winding'), step('b', 2, 'soldering'), step('c', 3, 'hipot')]

describe('RouteEditor', () => {
  it('moves a step down with its button, emitting the whole new order', async () => {
    const wrapper = mount(RouteEditor, { props: { steps, isEditable: true } })
    await wrapper.get('[aria-label="Move step 1 down"]').trigger('click')
    expect(wrapper.emitted('reorder')).toEqual([[['b', 'a', 'c']]])
  })

  it('disables moving the first step up and the last one down', () => {
    const wrapper = mount(RouteEditor, { props: { steps, isEditable: true } })
    expect(wrapper.get('[aria-label="Move step 1 up"]').attributes('disabled')).toBeDefined()
    expect(wrapper.get('[aria-label="Move step 3 down"]').attributes('disabled')).toBeDefined()
  })

  it('moves a step by drag and drop onto the lower half of another', async () => {
    const wrapper = mount(RouteEditor, { props: { steps, isEditable: true } })
    const slots = wrapper.findAll('li')
    await wrapper
      .findAll('[draggable="true"]')[0]!
      .trigger('dragstart', { dataTransfer: fakeTransfer() })
    // happy-dom lays nothing out: every box is 0 high, so any clientY > 0 is "after".
    await slots[2]!.trigger('dragover', { clientY: 5 })
    await slots[2]!.trigger('drop')
    expect(wrapper.emitted('reorder')).toEqual([[['b', 'c', 'a']]])
  })

  it('shows the high-voltage caution on hipot steps only', () => {
    const wrapper = mount(RouteEditor, { props: { steps, isEditable: false } })
    const cards = wrapper.findAll('article')
    expect(cards[2]!.text()).toContain(HIGH_VOLTAGE_CAUTION)
    expect(cards[0]!.text()).not.toContain(HIGH_VOLTAGE_CAUTION)
  })

  it('offers no editing controls when read-only', () => {
    const wrapper = mount(RouteEditor, { props: { steps, isEditable: false } })
    expect(wrapper.find('[draggable="true"]').exists()).toBe(false)
    expect(wrapper.text()).not.toContain('Add step')
    expect(wrapper.text()).not.toContain('Edit step')
  })
})
