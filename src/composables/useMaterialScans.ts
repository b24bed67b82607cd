import { ref } from 'vue'
import type { Ref } from 'vue'
import { codeFromScan } from '@shared/links'
import type { FloorComponentLotDto } from '@shared/schemas/lots'
import type { BomLineDto } from '@shared/schemas/recipes'
import { messageOf } from '@/api/client'

/** One BOM line to scan at this step, with what the server said about the scanned lot. */
export interface MaterialEntry {
  line: BomLineDto
  /** As scanned or typed: a bare code or a `…/c/<code>` link. */
  scanned: string
  /** The item's own serial, for serial-traced lines. */
  itemSerial: string
  status: 'empty' | 'checking' | 'ok' | 'refused'
  lot: FloorComponentLotDto | null
  message: string
}

/** How long typing must pause before a lot typed by hand is checked. */
const TYPING_PAUSE_MS = 400

/**
 * The component lots scanned for the BOM lines of one step, each checked live against its line
 * by the server: once typing pauses, at once on Enter or when the field is left. A newer scan
 * of a line wins over an answer still on its way.
 * @param onEdit called with the line id when the operator changes a line, to clear its message
 */
export function useMaterialScans(
  lookup: (code: string, bomLineId: string) => Promise<FloorComponentLotDto>,
  onEdit: (lineId: string) => void,
) {
  const materials: Ref<MaterialEntry[]> = ref([])
  const timers = new Map<string, ReturnType<typeof setTimeout>>()
  const pending = new Map<string, Promise<void>>()
  const tokens = new Map<string, number>()
  /** The code each line's lookup in flight asks about. */
  const asking = new Map<string, string>()

  const find = (lineId: string) => materials.value.find((m) => m.line.id === lineId)

  /** Starts over with the lines of a newly scanned unit's step. */
  function reset(lines: readonly BomLineDto[]) {
    for (const t of timers.values()) clearTimeout(t)
    timers.clear()
    pending.clear()
    materials.value = lines.map((line) => ({
      line,
      scanned: '',
      itemSerial: '',
      status: 'empty',
      lot: null,
      message: '',
    }))
  }

  /** Asks the server about the scanned lot now. */
  function verify(lineId: string): Promise<void> {
    const m = find(lineId)
    if (!m) return Promise.resolve()
    clearTimeout(timers.get(lineId))
    const code = codeFromScan(m.scanned)
    if (!code) {
      Object.assign(m, { status: 'empty', lot: null, message: '' })
      return Promise.resolve()
    }
    if (m.status !== 'checking' && m.lot?.internalCode === code) return Promise.resolve()
    // Enter asks at once and then moves on, which leaves the field (blur): ask once, not twice.
    const inFlight = pending.get(lineId)
    if (inFlight && asking.get(lineId) === code) return inFlight
    const token = (tokens.get(lineId) ?? 0) + 1
    tokens.set(lineId, token)
    Object.assign(m, { status: 'checking', message: '' })
    asking.set(lineId, code)
    const job = lookup(code, lineId)
      .then((lot) => {
        if (tokens.get(lineId) !== token) return
        Object.assign(m, {
          lot,
          status: lot.refusal ? 'refused' : 'ok',
          message: lot.refusal ?? '',
        })
      })
      .catch((error: unknown) => {
        if (tokens.get(lineId) !== token) return
        Object.assign(m, { lot: null, status: 'refused', message: messageOf(error) })
      })
      .finally(() => {
        if (tokens.get(lineId) !== token) return
        pending.delete(lineId)
        asking.delete(lineId)
      })
    pending.set(lineId, job)
    return job
  }

  /** Takes what was typed or scanned into a lot field. */
  function setScanned(lineId: string, text: string) {
    const m = find(lineId)
    if (!m) return
    m.scanned = text
    onEdit(lineId)
    Object.assign(m, { status: text.trim() ? 'checking' : 'empty', lot: null, message: '' })
    clearTimeout(timers.get(lineId))
    if (text.trim())
      timers.set(
        lineId,
        setTimeout(() => void verify(lineId), TYPING_PAUSE_MS),
      )
  }

  function setItemSerial(lineId: string, text: string) {
    const m = find(lineId)
    if (m) m.itemSerial = text
    onEdit(lineId)
  }

  /** Puts a scanned lot label into the first line still empty; returns that line's id. */
  function fillNext(code: string): string | null {
    const m = materials.value.find((x) => x.status === 'empty')
    if (!m) return null
    setScanned(m.line.id, code)
    void verify(m.line.id)
    return m.line.id
  }

  /** Waits until every line has its answer; a line still waiting for its typing pause is asked now. */
  async function settle() {
    for (const m of materials.value)
      if (m.status === 'checking' && !pending.has(m.line.id)) void verify(m.line.id)
    await Promise.all(pending.values())
  }

  return { materials, find, reset, verify, setScanned, setItemSerial, fillNext, settle }
}
