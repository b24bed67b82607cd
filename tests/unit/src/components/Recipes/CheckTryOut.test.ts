import { mount } from '@vue/test-utils'
import { describe, expect, it } from 'vitest'
import type { CheckDto, WindingDto } from '@shared/schemas/recipes'
import CheckTryOut from '@/components/Recipes/CheckTryOut.vue'

function check(overrides: Partial<CheckDto>): CheckDto {
  return {
    id: 'c1',
    stepId: 's1',
    position: 1,
    key: 'v_out',
    label: 'Output voltage',
    kind: 'numeric',
    unit: 'V',
    nominal: 350,
    lower: 345,
    upper: 355,
    decimals: 1,
    choices: null,
    derived: null,
    derivedInputs: null,
    isKey: false,
    isForCustomers: true,
    ...overrides,
  }
}

const secondary: WindingDto = {
  id: 'w-sec',
  position: 1,
  name: 'secondary',
  nominalTurns: 92,
  alNanoHenry: 3000,
  alTolerancePercent: 25,
  coreAreaMm2: 125,
}

describe('CheckTryOut', () => {
  it('turns pass and fail as a value is typed', async () => {
    const wrapper = mount(CheckTryOut, { props: { check: check({}), siblings: [], windings: [] } })
    expect(wrapper.get('[role="status"]').text()).toBe('Waiting for a value')

    const input = wrapper.get('input')
    await input.setValue('350.2')
    expect(wrapper.get('[role="status"]').text()).toBe('Pass')
    await input.setValue('356')
    expect(wrapper.get('[role="status"]').text()).toBe('Fail')
    // Limits are inclusive: a reading on the limit passes.
    await input.setValue('355')
    expect(wrapper.get('[role="status"]').text()).toBe('Pass')
  })

  it('reads a decimal comma as a decimal point', async () => {
    const wrapper = mount(CheckTryOut, { props: { check: check({}), siblings: [], windings: [] } })
    await wrapper.get('input').setValue('344,9')
    expect(wrapper.get('[role="status"]').text()).toBe('Fail')
  })

  it('computes a derived check from example inputs and judges it', async () => {
    // L = AL·N²: 92 turns on AL 3000 nH/turn² is 25.392 mH, so 25.392 mH reads back as 92.0 turns.
    const inductance = check({
      id: 'c-l',
      key: 'l_sec',
      label: 'Inductance, secondary',
      unit: 'mH',
      lower: null,
      upper: null,
      nominal: null,
    })
    const turns = check({
      key: 'n_sec',
      label: 'Secondary turns',
      unit: 'turns',
      nominal: 92,
      lower: 91.5,
      upper: 92.5,
      derived: 'turns_from_inductance',
      derivedInputs: { inductance: 'l_sec', winding: 'w-sec' },
    })
    const wrapper = mount(CheckTryOut, {
      props: { check: turns, siblings: [inductance], windings: [secondary] },
    })
    expect(wrapper.text()).toContain('secondary: 92 turns')

    await wrapper.get('input').setValue('25.392')
    expect(wrapper.get('[data-test="derived-value"]').text()).toBe('92.0 turns')
    expect(wrapper.findAll('[role="status"]').at(-1)!.text()).toBe('Pass')

    // Two turns short (90 turns: 24.3 mH), the miscount the winding bench must catch.
    await wrapper.get('input').setValue('24.3')
    expect(wrapper.get('[data-test="derived-value"]').text()).toBe('90.0 turns')
    expect(wrapper.findAll('[role="status"]').at(-1)!.text()).toBe('Fail')
  })

  it('says which input is still unmapped', () => {
    const turns = check({ derived: 'turns_from_inductance', derivedInputs: {}, unit: 'turns' })
    const wrapper = mount(CheckTryOut, { props: { check: turns, siblings: [], windings: [] } })
    expect(wrapper.text()).toContain('choose the check it reads first')
    expect(wrapper.text()).toContain('choose the winding first')
  })
})
