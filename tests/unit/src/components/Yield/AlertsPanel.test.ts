import { flushPromises, mount, RouterLinkStub } from '@vue/test-utils'
import { createPinia, setActivePinia } from 'pinia'
import { beforeEach, describe, expect, it, vi } from 'vitest'
import type { AlertDto } from '@shared/schemas/alerts'
import AlertsPanel from '@/components/Yield/AlertsPanel.vue'
import { useSessionStore } from '@/stores/session'

const api = vi.hoisted(() => ({ list: vi.fn(), acknowledge: vi.fn() }))
vi.mock('@/api/alerts', () => ({ alertsApi: api }))

function alert(over: Partial<AlertDto>): AlertDto {
  return {
    id: 'a1',
    lotId: 'lot-1',
    lotNumber: 'L-0042',
    stepId: 's1',
    stepName: 'Load test',
    rule: 'fpy_below_threshold',
    checkId: null,
    checkLabel: null,
    checkUnit: null,
    details: {
      kind: 'fpy',
      passedFirst: 8,
      firstAttempts: 10,
      fpy: 0.8,
      thresholdPercent: 90,
      interval: { low: 0.49, high: 0.943 },
    },
    headline: 'First-pass yield 80.0 % is below 90 %',
    status: 'open',
    acknowledgedBy: null,
    acknowledgedAt: null,
    createdAt: '2026-12-01T10:00:00.000Z',
    ...over,
  }
}

async function mountAs(role: 'lead' | 'engineer', lotId?: string) {
  const pinia = createPinia()
  setActivePinia(pinia)
  useSessionStore().user = { id: 'u1', email: `${role}@example.test`, name: 'Someone', role }
  const wrapper = mount(AlertsPanel, {
    props: { lotId },
    global: { plugins: [pinia], stubs: { RouterLink: RouterLinkStub } },
  })
  await flushPromises()
  return wrapper
}

describe('AlertsPanel', () => {
  beforeEach(() => {
    api.list.mockReset()
    api.acknowledge.mockReset()
  })

  it("asks for the lot's alerts and lists open ones first", async () => {
    api.list.mockResolvedValue([
      alert({
        id: 'old',
        status: 'acknowledged',
        acknowledgedAt: '2026-12-01T12:00:00.000Z',
        createdAt: '2026-12-01T11:00:00.000Z',
      }),
      alert({ id: 'new', stepName: 'Hipot', createdAt: '2026-12-01T09:00:00.000Z' }),
    ])
    const wrapper = await mountAs('lead', 'lot-1')
    expect(api.list).toHaveBeenCalledWith({ lotId: 'lot-1' })
    const rows = wrapper.findAll('.alerts__row')
    expect(rows.map((r) => r.classes('alerts__row--done'))).toEqual([false, true])
    expect(rows[0]!.text()).toContain('Hipot')
    expect(wrapper.text()).toContain('1 open')
  })

  it('offers Acknowledge to a lead on open alerts only, and shows the answer', async () => {
    api.list.mockResolvedValue([alert({})])
    api.acknowledge.mockResolvedValue(
      alert({
        status: 'acknowledged',
        acknowledgedBy: { id: 'u1', name: 'Dev Okafor' },
        acknowledgedAt: '2026-12-01T12:00:00.000Z',
      }),
    )
    const wrapper = await mountAs('lead', 'lot-1')
    const button = wrapper.findAll('button').find((b) => b.text() === 'Acknowledge')!
    await button.trigger('click')
    await flushPromises()
    expect(api.acknowledge).toHaveBeenCalledWith('a1')
    expect(wrapper.text()).toContain('by Dev Okafor')
    expect(wrapper.findAll('button').some((b) => b.text() === 'Acknowledge')).toBe(false)
  })

  it('shows no Acknowledge button to an engineer, and links lots when not on one lot', async () => {
    api.list.mockResolvedValue([alert({})])
    const wrapper = await mountAs('engineer')
    expect(wrapper.findAll('button').some((b) => b.text() === 'Acknowledge')).toBe(false)
    expect(wrapper.findComponent(RouterLinkStub).props('to')).toEqual({
      name: 'lot',
      params: { id: 'lot-1' },
    })
  })

  it('says so when there is no alert', async () => {
    api.list.mockResolvedValue([])
    const wrapper = await mountAs('lead', 'lot-1')
    expect(wrapper.text()).toContain('No quality alert on this lot')
  })
})
