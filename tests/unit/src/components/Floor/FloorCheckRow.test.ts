import { mount } from '@vue/test-utils'
import { defineComponent, h, ref } from 'vue'
import { describe, expect, it, vi } from 'vitest'
import type { FloorUnitDto } from '@shared/schemas/lots'
import type { CheckDto } from '@shared/schemas/recipes'
import FloorCheckRow from '@/components/Floor/FloorCheckRow.vue'
import { checkFieldId, useFloorForm } from '@/composables/useFloorForm'
import { floorUnit, numericCheck } from './fixtures'

/** The Floor's rows wired to the Floor's form, as FloorView wires them. */
function mountForm(checks: CheckDto[]) {
  const unit = ref<FloorUnitDto | null>(floorUnit(checks))
  const Harness = defineComponent({
    setup() {
      const form = useFloorForm(unit, vi.fn())
      return () =>
        h(
          'div',
          form.checks.value.map((check) =>
            h(FloorCheckRow, {
              check,
              entry: form.entries[check.key] ?? null,
              result: form.results.value[check.key],
              fieldId: checkFieldId(check.key),
              'onUpdate:entry': (entry: string | boolean | null) => form.setEntry(check.key, entry),
            }),
          ),
        )
    },
  })
  return mount(Harness)
}

describe('FloorCheckRow', () => {
  it('turns fail as a value outside the limits is typed, and pass once corrected', async () => {
    const wrapper = mountForm([numericCheck()])
    const input = wrapper.get('[data-field="check:l_primary_a"]')
    expect(input.classes()).not.toContain('is-fail')

    await input.setValue('150')
    expect(input.classes()).toContain('is-fail')
    expect(input.attributes('aria-invalid')).toBe('true')
    expect(wrapper.get('[data-check="l_primary_a"]').attributes('data-verdict')).toBe('fail')
    expect(wrapper.get('.check-row__verdict').text()).toContain('high')

    await input.setValue('108')
    expect(input.classes()).toContain('is-pass')
    expect(input.classes()).not.toContain('is-fail')
  })

  it('passes a reading on a limit: limits are inclusive', async () => {
    const wrapper = mountForm([numericCheck()])
    const input = wrapper.get('input')
    await input.setValue('81')
    expect(input.classes()).toContain('is-pass')
    await input.setValue('80.9')
    expect(wrapper.get('.check-row__verdict').text()).toContain('low')
  })

  it('shows the limits the way the bench reads them', () => {
    const wrapper = mountForm([numericCheck()])
    expect(wrapper.get('.check-row__limits').text()).toContain('81 – 135 µH')
  })

  it('shows a derived check as a computed value, not an input, updated as readings are typed', async () => {
    // L = AL·N²: 25.392 mH on AL 3000 nH/turn² is √(25.392e-3 / 3000e-9) = 92.0 turns (DESIGN.md §7).
    const inductance = numericCheck({
      id: 'c-ls',
      key: 'l_secondary',
      label: 'Inductance, secondary',
      unit: 'mH',
      lower: 19,
      upper: 31.8,
      nominal: 25.4,
      decimals: 2,
    })
    const turns = numericCheck({
      id: 'c-n',
      position: 2,
      key: 'secondary_turns_est',
      label: 'Secondary turns from inductance',
      unit: 'turns',
      lower: 80,
      upper: 104,
      nominal: 92,
      derived: 'turns_from_inductance',
      derivedInputs: { inductance: 'l_secondary', winding: 'w-sec' },
    })
    const wrapper = mountForm([inductance, turns])
    expect(wrapper.findAll('input')).toHaveLength(1)
    expect(wrapper.get('[data-test="derived-value"]').text()).toBe('waiting for readings')
    await wrapper.get('input').setValue('25.392')
    expect(wrapper.get('[data-test="derived-value"]').text()).toBe('92.0 turns')
    expect(wrapper.get('[data-check="secondary_turns_est"]').attributes('data-verdict')).toBe(
      'pass',
    )
  })

  it('moves on with Enter, and hands a scanned traveler link over as a scan', async () => {
    const wrapper = mount(FloorCheckRow, {
      props: { check: numericCheck(), entry: '', result: undefined, fieldId: 'check:l_primary_a' },
    })
    await wrapper.get('input').trigger('keydown', { key: 'Enter' })
    expect(wrapper.emitted('next')).toHaveLength(1)

    await wrapper.setProps({ entry: 'https://waymark.example/u/FP24-2649-00018I' })
    await wrapper.get('input').trigger('keydown', { key: 'Enter' })
    expect(wrapper.emitted('scan')?.[0]).toEqual(['https://waymark.example/u/FP24-2649-00018I'])
    expect(wrapper.emitted('update:entry')?.at(-1)).toEqual([''])
  })
})
