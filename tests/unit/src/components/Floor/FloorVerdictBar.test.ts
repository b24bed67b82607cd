import { mount } from '@vue/test-utils'
import { describe, expect, it } from 'vitest'
import FloorVerdictBar from '@/components/Floor/FloorVerdictBar.vue'

const bar = (props: Partial<InstanceType<typeof FloorVerdictBar>['$props']>) =>
  mount(FloorVerdictBar, {
    props: {
      verdict: 'pass',
      failed: [],
      toFill: 0,
      openMaterials: [],
      isRecording: false,
      canRecord: true,
      ...props,
    },
  })

describe('FloorVerdictBar', () => {
  it('says PASS only when every reading is in and every lot accepted', () => {
    expect(bar({}).get('[data-test=verdict]').attributes('data-verdict')).toBe('pass')
    expect(bar({}).text()).toContain('PASS')
  })

  it('never says PASS while a lot is refused, even with every reading in limits', () => {
    const w = bar({ toFill: 1, openMaterials: [{ partNumber: 'FCS-3000U', isRefused: true }] })
    expect(w.text()).not.toContain('PASS')
    expect(w.text()).toContain('LOT REFUSED')
    expect(w.text()).toContain('Scan another lot for FCS-3000U')
    expect(w.get('[data-test=verdict]').attributes('data-verdict')).toBe('open')
  })

  it('names every line still to scan and counts the readings left', () => {
    const w = bar({
      verdict: 'missing',
      toFill: 3,
      openMaterials: [
        { partNumber: 'FCS-3000U', isRefused: false },
        { partNumber: 'PCB-FP24-B', isRefused: false },
      ],
    })
    expect(w.text()).toContain('3 to go')
    expect(w.text()).toContain('Still to scan: FCS-3000U, PCB-FP24-B · and 1 reading')
  })
})
