import { flushPromises, mount, RouterLinkStub } from '@vue/test-utils'
import { createPinia, setActivePinia } from 'pinia'
import { beforeEach, describe, expect, it, vi } from 'vitest'
import type { AlertDto } from '@shared/schemas/alerts'
import AlertsPanel from '@/components/Yield/AlertsPanel.vue'
import { useSessionStore } from '@/stores/session'

const api = vi.hoisted(() => ({ list: vi.fn(), acknowledge: vi.fn(), acknowledgeAll: vi.fn() }))
vi.mock('@/api/alerts', () => ({ alertsApi: api }))

function alert(over: Partial<AlertDto>): AlertDto {
  return {
    id: 'a1',
    lotId: 'lot-1',
    lotNumber: 'L-0042',
    stepId: 's1',
    stepName: 'Load test',
    rule: 'fpy_below_threshold',
    rules: ['fpy_below_threshold'],
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
      station: 'Load-test rack 1',
    },
    summary:
      'Load-test rack 1: first-pass yield 80.0 % (8 of 10 first attempts) is below the 90 % threshold; look at the Pareto.',
    headline: 'First-pass yield 80.0 % is below 90 %',
    status: 'open',
    isBackInControl: false,
    endedAt: null,
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
    api.acknowledgeAll.mockReset()
  })

  it("asks for the lot's alerts and lists open ones, one line each, plain words first", async () => {
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
    const rows = wrapper.findAll('.alerts__item')
    expect(rows).toHaveLength(1)
    expect(rows[0]!.find('.alerts__line').text()).toContain('Hipot')
    expect(rows[0]!.find('.alerts__what').text()).toMatch(/^Load-test rack 1: first-pass yield/)
    expect(wrapper.text()).toContain('1 open alert on this lot')
    // The acknowledged one on request, after the open one.
    await wrapper
      .findAll('button')
      .find((b) => b.text() === 'Show 1 acknowledged')!
      .trigger('click')
    expect(wrapper.findAll('.alerts__item').map((r) => r.classes('is-done'))).toEqual([false, true])
  })

  it('opens the statistics of a line on request', async () => {
    api.list.mockResolvedValue([alert({})])
    const wrapper = await mountAs('engineer')
    expect(wrapper.find('.alerts__figures').exists()).toBe(false)
    await wrapper
      .findAll('button')
      .find((b) => b.text() === 'Figures')!
      .trigger('click')
    expect(wrapper.find('.alerts__figures').text()).toContain(
      '95 % Wilson interval: 49.0 % to 94.3 %',
    )
  })

  it('shows at most 4 lines and "and N more" for the rest', async () => {
    api.list.mockResolvedValue(
      Array.from({ length: 7 }, (_, i) =>
        alert({ id: `a${i}`, createdAt: `2026-12-01T1${i}:00:00.000Z` }),
      ),
    )
    const wrapper = await mountAs('engineer')
    expect(wrapper.findAll('.alerts__item')).toHaveLength(4)
    const more = wrapper.findAll('button').find((b) => b.text() === 'and 3 more')!
    await more.trigger('click')
    expect(wrapper.findAll('.alerts__item')).toHaveLength(7)
  })

  it('lets a lead acknowledge all, or all of one lot, and loads the list again', async () => {
    api.list.mockResolvedValueOnce([
      alert({ id: 'a1' }),
      alert({ id: 'a2' }),
      alert({ id: 'b1', lotId: 'lot-2', lotNumber: 'L-0043' }),
    ])
    api.list.mockResolvedValue([alert({ id: 'b1', lotId: 'lot-2', lotNumber: 'L-0043' })])
    api.acknowledgeAll.mockResolvedValue({ acknowledged: 2, ids: ['a1', 'a2'] })
    const wrapper = await mountAs('lead')
    expect(wrapper.findAll('button').some((b) => b.text() === 'Acknowledge all 3')).toBe(true)
    const ofLot = wrapper.findAll('button').find((b) => b.text() === 'All 2 of L-0042')!
    await ofLot.trigger('click')
    await flushPromises()
    expect(api.acknowledgeAll).toHaveBeenCalledWith('lot-1')
    expect(wrapper.findAll('.alerts__item')).toHaveLength(1)
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
    expect(wrapper.findAll('button').some((b) => b.text() === 'Acknowledge')).toBe(false)
    expect(wrapper.text()).toContain('0 open alerts on this lot')
    await wrapper
      .findAll('button')
      .find((b) => b.text() === 'Show 1 acknowledged')!
      .trigger('click')
    await wrapper
      .findAll('button')
      .find((b) => b.text() === 'Figures')!
      .trigger('click')
    expect(wrapper.text()).toContain('by Dev Okafor')
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
    expect(wrapper.text()).toContain('0 open alerts on this lot')
    expect(wrapper.findAll('.alerts__item')).toHaveLength(0)
  })
})
