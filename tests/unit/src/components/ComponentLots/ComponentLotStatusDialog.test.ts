import { flushPromises, mount } from '@vue/test-utils'
import { describe, expect, it, vi } from 'vitest'
import type { ComponentLotDto, ComponentLotStatusInput } from '@shared/schemas/componentLots'
import ComponentLotStatusDialog from '@/components/ComponentLots/ComponentLotStatusDialog.vue'
import { useEditDialog } from '@/composables/useEditDialog'

const asked: string[] = []
vi.mock('@/composables/confirmAction', () => ({
  confirmAction: async (message: string) => {
    asked.push(message)
    return true
  },
}))

const lot = (status: ComponentLotDto['status']): ComponentLotDto => ({
  id: 'l1',
  internalCode: 'CL-0042',
  partId: 'p1',
  partNumber: 'FER-E25',
  partDescription: 'E25 core',
  unitOfMeasure: 'pcs',
  supplierId: 's1',
  supplierName: 'Cores Ltd',
  supplierLotCode: 'B-7',
  quantityReceived: 100,
  quantityRemaining: 100,
  receivedOn: '2026-11-02',
  expiresOn: null,
  isExpired: false,
  status,
  notes: '',
  certificate: null,
  awaitsInspection: false,
  inspectedAt: null,
  inspectionNote: '',
})

const footer = () =>
  [...document.querySelectorAll('.el-dialog__footer button')] as HTMLButtonElement[]

describe('ComponentLotStatusDialog', () => {
  it('offers the lot’s moves as cards, confirms, and saves the chosen move with the reason', async () => {
    const saved: ComponentLotStatusInput[] = []
    const dialog = useEditDialog<ComponentLotDto, ComponentLotStatusInput>(
      async (_lot, input) => void saved.push(input),
      () => 'Status changed',
    )
    const wrapper = mount(ComponentLotStatusDialog, { props: { dialog }, attachTo: document.body })
    dialog.open(lot('available'))
    await flushPromises()
    expect(document.querySelector('.el-dialog__title')?.textContent).toBe('Status of lot CL-0042')
    const cards = [...document.querySelectorAll('.el-radio')]
    expect(cards.map((c) => c.querySelector('strong')?.textContent)).toEqual([
      'Quarantined',
      'Rejected',
    ])
    expect(footer().map((b) => b.textContent?.trim())).toEqual(['Cancel', 'Change status'])

    cards[0]!.querySelector('input')!.click()
    const reason = document.querySelector<HTMLTextAreaElement>('.el-dialog textarea')!
    reason.value = 'Supplier notice: wrong grade'
    reason.dispatchEvent(new Event('input'))
    await flushPromises()
    footer()[1]!.click()
    await flushPromises()
    expect(asked).toEqual([
      'Mark lot CL-0042 as quarantined? Held: operators cannot fit parts from it until it is released back.',
    ])
    expect(saved).toEqual([{ status: 'quarantined', reason: 'Supplier notice: wrong grade' }])
    wrapper.unmount()
  })

  it('has only Close for a rejected lot, which has no move left', async () => {
    const dialog = useEditDialog<ComponentLotDto, ComponentLotStatusInput>(
      async () => undefined,
      () => 'Status changed',
    )
    const wrapper = mount(ComponentLotStatusDialog, { props: { dialog }, attachTo: document.body })
    dialog.open(lot('rejected'))
    await flushPromises()
    expect(document.querySelector('.el-dialog')?.textContent).toContain(
      'A rejected lot stays rejected.',
    )
    expect(document.querySelectorAll('.el-dialog .el-radio')).toHaveLength(0)
    expect(footer().map((b) => b.textContent?.trim())).toEqual(['Close'])
    wrapper.unmount()
  })
})
