import { ref } from 'vue'
import type { Ref } from 'vue'
import { saving } from './saving'
import { whileLoading } from './whileLoading'

/** The calls of a resource whose whole list the browser keeps. */
export interface RecordListApi<T, C, U> {
  list(): Promise<T[]>
  create(input: C): Promise<T>
  update(id: string, input: U): Promise<T>
}

/**
 * A short list held whole and sorted in the browser (stations, users, defect codes, products),
 * for a setup store: each save puts the server's answer in its place, so no refetch is needed.
 * @param api the resource's list, create and update calls
 * @param sortKey the text the list is sorted by, e.g. a station's code
 */
export function useRecordList<T extends { id: string }, C, U>(
  api: RecordListApi<T, C, U>,
  sortKey: (record: T) => string,
) {
  /** Every record, sorted. */
  const rows = ref([]) as Ref<T[]>
  /** True while the list is being fetched. */
  const isLoading = ref(false)
  const bySortKey = (a: T, b: T) => sortKey(a).localeCompare(sortKey(b))

  /** Puts a record in its place, in place of the one with its id. */
  function put(record: T) {
    rows.value = [...rows.value.filter((r) => r.id !== record.id), record].sort(bySortKey)
  }

  /** Fetches every record; throws ApiError, the view decides how to show it. */
  async function fetchAll() {
    rows.value = (await whileLoading(isLoading, () => api.list())).sort(bySortKey)
  }

  /** Creates a record and keeps it in the list. */
  const create = saving((input: C) => api.create(input), put)
  /** Updates a record and puts the server's answer back in the list. */
  const update = saving((id: string, input: U) => api.update(id, input), put)

  return { rows, isLoading, put, fetchAll, create, update }
}
