import { defineStore } from 'pinia'
import { computed, ref } from 'vue'
import type { DocumentDto } from '@shared/schemas/lots'
import type { ShipmentCreateInput, ShipmentDto, ShippableUnitDto } from '@shared/schemas/shipping'
import { ApiError } from '@/api/client'
import { shipmentsApi } from '@/api/shipments'
import { useFetched } from './lists/useFetched'

/** One scan at the packing bench, as the list beside the scan box shows it. */
export interface PackScan {
  /** What the scanner typed. */
  scanned: string
  /** The unit when the serial is known. */
  unit: ShippableUnitDto | null
  /** Why the scan was not added; null when it was. */
  problem: string | null
  at: number
}

export const useShippingStore = defineStore('shipping', () => {
  /** Recent shipments, newest first; `fetchAll` throws ApiError. */
  const { data: shipments, isLoading, load: fetchAll } = useFetched(() => shipmentsApi.list(), [])
  /** Units scanned into the shipment being packed, in scan order. */
  const packed = ref<ShippableUnitDto[]>([])
  /** Every scan at this bench, newest first, including the refused ones. */
  const scans = ref<PackScan[]>([])
  /** The shipment open in the drawer. */
  const current = ref<ShipmentDto | null>(null)
  /** True while any of the open shipment's documents is still being made. */
  const isMakingDocuments = computed(
    () =>
      current.value?.documents.some((d) => d.status === 'queued' || d.status === 'running') ??
      false,
  )

  /**
   * Checks one scan at once and adds the unit when it may ship. Never throws: a refusal is
   * listed with its reason, so the packer sees it beside the scan box.
   */
  async function scan(scanned: string): Promise<PackScan> {
    const entry: PackScan = { scanned, unit: null, problem: null, at: Date.now() }
    try {
      const unit = await shipmentsApi.check(scanned)
      entry.unit = unit
      if (packed.value.some((u) => u.serial === unit.serial))
        entry.problem = 'already in this shipment'
      else if (unit.refusal) entry.problem = unit.refusal
      else packed.value.push(unit)
    } catch (error) {
      entry.problem =
        error instanceof ApiError && error.status === 404
          ? 'no unit has this serial: check the label'
          : error instanceof Error
            ? error.message
            : String(error)
    }
    scans.value.unshift(entry)
    return entry
  }

  /** Takes a unit out of the shipment being packed. */
  function unpack(serial: string) {
    packed.value = packed.value.filter((u) => u.serial !== serial)
  }

  /** Empties the bench for the next shipment. */
  function resetPack() {
    packed.value = []
    scans.value = []
  }

  /** Ships the packed units; throws ApiError (409 `units_not_shippable` lists the serials). */
  async function ship(input: Omit<ShipmentCreateInput, 'serials'>): Promise<ShipmentDto> {
    const shipment = await shipmentsApi.create({
      ...input,
      serials: packed.value.map((u) => u.serial),
    })
    resetPack()
    current.value = shipment
    await fetchAll()
    return shipment
  }

  /** Opens a shipment in the drawer; throws ApiError. */
  async function open(id: string) {
    current.value = await shipmentsApi.get(id)
  }

  /** Reloads the open shipment (its documents' progress). */
  async function refreshCurrent() {
    if (current.value) current.value = await shipmentsApi.get(current.value.id)
  }

  /**
   * Asks the documents worker for a certificate of the open shipment; `confirmOpenReturn` says
   * the person knows one of its units has a return open (else 409 `open_return`).
   */
  async function makeCertificate(confirmOpenReturn = false): Promise<DocumentDto | null> {
    if (!current.value) return null
    const doc = await shipmentsApi.certificate(current.value.id, confirmOpenReturn)
    await refreshCurrent()
    return doc
  }

  function close() {
    current.value = null
  }

  return {
    shipments,
    isLoading,
    packed,
    scans,
    current,
    isMakingDocuments,
    fetchAll,
    scan,
    unpack,
    resetPack,
    ship,
    open,
    refreshCurrent,
    makeCertificate,
    close,
  }
})
