import { defineStore } from 'pinia'
import { ref } from 'vue'
import type { ImportMapping } from '@shared/imports'
import type {
  ImportDto,
  ImportMappingDto,
  ImportRowDto,
  ImportRowsQuery,
} from '@shared/schemas/imports'
import { importsApi } from '@/api/imports'
import { whileLoading } from './lists/whileLoading'

const POLL_MS = 1000

/** A mapping with every choice of a column this file lacks cleared, for the person to redo. */
function inFile(mapping: ImportMapping, columns: readonly string[]): ImportMapping {
  const has = (c: string | null) => (c !== null && columns.includes(c) ? c : null)
  return {
    serialColumn: has(mapping.serialColumn) ?? '',
    timeColumn: has(mapping.timeColumn),
    operatorColumn: has(mapping.operatorColumn),
    checkColumns: Object.fromEntries(
      Object.entries(mapping.checkColumns).filter(([, c]) => columns.includes(c)),
    ),
  }
}

/** One bench file on its way through the Bench import screen, and the latest imports. */
export const useImportsStore = defineStore('imports', () => {
  const recent = ref<ImportDto[]>([])
  /** The import on screen, or null before a file is dropped. */
  const current = ref<ImportDto | null>(null)
  /** The station's checks and saved mapping. */
  const mappingInfo = ref<ImportMappingDto | null>(null)
  /** The mapping being adjusted on screen, saved before each dry run. */
  const draft = ref<ImportMapping | null>(null)
  const rows = ref<ImportRowDto[]>([])
  const total = ref(0)
  const show = ref<ImportRowsQuery['show']>('all')
  const page = ref(1)
  const pageSize = ref(50)
  const isBusy = ref(false)
  let timer: ReturnType<typeof setTimeout> | undefined

  async function fetchRecent() {
    recent.value = await importsApi.list()
  }

  async function fetchRows() {
    if (!current.value?.checkedAt) {
      rows.value = []
      total.value = 0
      return
    }
    const out = await importsApi.rows(current.value.id, {
      show: show.value,
      page: page.value,
      pageSize: pageSize.value,
    })
    rows.value = out.rows
    total.value = out.total
  }

  async function show_(imp: ImportDto) {
    current.value = imp
    mappingInfo.value = await importsApi.mapping(imp.stationCode)
    draft.value = inFile(imp.mapping ?? imp.proposedMapping, imp.columns)
    page.value = 1
    await fetchRows()
    watchProgress()
  }

  async function open(id: string) {
    await show_(await importsApi.get(id))
  }

  async function upload(stationCode: string, file: File) {
    await whileLoading(isBusy, async () => {
      await show_(await importsApi.upload(stationCode, file))
      await fetchRecent()
    })
  }

  /** Saves the mapping on screen for the station, then asks for every row to be checked. */
  async function check() {
    if (!current.value || !draft.value) return
    const { id, stationCode } = current.value
    const mapping = draft.value
    await whileLoading(isBusy, async () => {
      mappingInfo.value = await importsApi.saveMapping(stationCode, mapping)
      current.value = await importsApi.dryRun(id)
      watchProgress()
    })
  }

  /** The rows of a finished dry run, those with problems first when there are any. */
  async function showChecked() {
    page.value = 1
    show.value = current.value?.counts.errors ? 'errors' : 'all'
    await fetchRows()
  }

  async function run(defectCodeId: string | null) {
    if (!current.value) return
    const { id } = current.value
    await whileLoading(isBusy, async () => {
      current.value = await importsApi.run(id, { defectCodeId })
      watchProgress()
    })
  }

  /**
   * Polls the import while its dry run or its import job waits or runs, then reloads the rows:
   * with their problems after a dry run, with their outcomes after the import.
   */
  function watchProgress() {
    clearTimeout(timer)
    const imp = current.value
    if (!imp || !['checking', 'queued', 'running'].includes(imp.status)) return
    timer = setTimeout(async () => {
      try {
        const next = await importsApi.get(imp.id)
        if (current.value?.id !== imp.id) return
        current.value = next
        if (imp.status === 'checking' && next.status !== 'checking') await showChecked()
        if (next.status === 'done' || next.status === 'failed') {
          show.value = 'all'
          await Promise.all([fetchRows(), fetchRecent()])
        }
      } finally {
        watchProgress()
      }
    }, POLL_MS)
  }

  function stop() {
    clearTimeout(timer)
  }

  function reset() {
    stop()
    current.value = null
    rows.value = []
    total.value = 0
  }

  return {
    recent,
    current,
    mappingInfo,
    draft,
    rows,
    total,
    show,
    page,
    pageSize,
    isBusy,
    fetchRecent,
    fetchRows,
    open,
    upload,
    check,
    run,
    stop,
    reset,
  }
})
