import { mount } from '@vue/test-utils'
import { ElPagination, ElTable } from 'element-plus'
import { describe, expect, it } from 'vitest'
import PagedTable from '@/components/PagedTable.vue'

const base = { rows: [], isLoading: false, emptyText: 'No parts yet.' }

describe('PagedTable', () => {
  it('says the list is empty, or why it could not be loaded', () => {
    expect(mount(PagedTable, { props: base }).text()).toContain('No parts yet.')
    const failed = mount(PagedTable, {
      props: { ...base, loadError: 'The server is not answering' },
    })
    expect(failed.text()).toContain('The server is not answering')
    expect(failed.text()).not.toContain('No parts yet.')
  })

  it('shows the pager only for a list paged on the server', () => {
    expect(mount(PagedTable, { props: base }).findComponent(ElPagination).exists()).toBe(false)
    const paged = mount(PagedTable, { props: { ...base, total: 120 } })
    expect(paged.findComponent(ElPagination).exists()).toBe(true)
  })

  it('asks for the first page again when the page size changes', () => {
    const paged = mount(PagedTable, { props: { ...base, total: 120, page: 3, pageSize: 25 } })
    paged.findComponent(ElPagination).vm.$emit('size-change', 50)
    expect(paged.emitted('update:pageSize')).toEqual([[50]])
    expect(paged.emitted('search')).toHaveLength(1)
  })

  it('passes the table sort to the server in its words, and the list order when cleared', () => {
    const table = mount(PagedTable, { props: base })
    const el = table.findComponent(ElTable)
    el.vm.$emit('sort-change', { prop: 'partNumber', order: 'descending' })
    el.vm.$emit('sort-change', { prop: 'partNumber', order: null })
    expect(table.emitted('sort')).toEqual([
      ['partNumber', 'desc'],
      [null, 'asc'],
    ])
  })
})
