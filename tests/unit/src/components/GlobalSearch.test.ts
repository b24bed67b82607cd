import { mount } from '@vue/test-utils'
import { afterEach, describe, expect, it } from 'vitest'
import type { SearchGroupDto, SearchHitDto } from '@shared/schemas/search'
import GlobalSearch from '@/components/GlobalSearch.vue'

const hit = (kind: SearchHitDto['kind'], title: string): SearchHitDto => ({
  kind,
  id: `${kind}-${title}`,
  title,
  detail: `detail of ${title}`,
  ref: title,
  note: null,
})
const GROUPS: SearchGroupDto[] = [
  { kind: 'unit', label: 'Units', hits: [hit('unit', 'FP24-2649-000176')] },
  { kind: 'lot', label: 'Lots', hits: [hit('lot', 'L-0042'), hit('lot', 'L-0043')] },
]

function mountSearch(
  props: Partial<{ groups: SearchGroupDto[]; answered: string; query: string }>,
) {
  return mount(GlobalSearch, {
    attachTo: document.body,
    props: {
      groups: props.groups ?? GROUPS,
      answered: props.answered ?? 'L-004',
      isLoading: false,
      problem: null,
      query: props.query ?? 'L-004',
      'onUpdate:query': () => undefined,
    },
  })
}

afterEach(() => {
  document.body.innerHTML = ''
})

describe('GlobalSearch', () => {
  it('focuses the box on "/" pressed outside a field, and not while typing in one', async () => {
    const wrapper = mountSearch({ query: '' })
    const box = wrapper.get('input').element
    document.body.dispatchEvent(new KeyboardEvent('keydown', { key: '/', bubbles: true }))
    expect(document.activeElement).toBe(box)

    box.blur()
    const other = document.createElement('input')
    document.body.appendChild(other)
    other.focus()
    other.dispatchEvent(new KeyboardEvent('keydown', { key: '/', bubbles: true }))
    expect(document.activeElement).toBe(other)
    wrapper.unmount()
  })

  it('lists hits under their group, moves with the arrows and opens one with Enter', async () => {
    const wrapper = mountSearch({})
    const input = wrapper.get('input')
    await input.trigger('focus')
    expect(wrapper.findAll('[role="group"]').map((g) => g.attributes('aria-label'))).toEqual([
      'Units',
      'Lots',
    ])
    const selected = () => wrapper.get('[aria-selected="true"]').text()
    expect(selected()).toContain('FP24-2649-000176')
    await input.trigger('keydown', { key: 'ArrowDown' })
    await input.trigger('keydown', { key: 'ArrowDown' })
    expect(selected()).toContain('L-0043')
    await input.trigger('keydown', { key: 'ArrowDown' })
    expect(selected()).toContain('FP24-2649-000176')
    await input.trigger('keydown', { key: 'ArrowUp' })
    await input.trigger('keydown', { key: 'Enter' })
    expect(wrapper.emitted('open')).toEqual([[GROUPS[1]!.hits[1]]])
    expect(wrapper.emitted('update:query')).toEqual([['']])
    wrapper.unmount()
  })

  it('opens the first hit once it arrives when Enter came before the answer', async () => {
    const wrapper = mountSearch({ groups: [], answered: '', query: 'FP24-2649-00017' })
    const input = wrapper.get('input')
    await input.trigger('focus')
    expect(wrapper.text()).toContain('Searching')
    await input.trigger('keydown', { key: 'Enter' })
    expect(wrapper.emitted('open')).toBeUndefined()
    await wrapper.setProps({ groups: GROUPS, answered: 'FP24-2649-00017' })
    expect(wrapper.emitted('open')).toEqual([[GROUPS[0]!.hits[0]]])
    wrapper.unmount()
  })

  it('says when nothing was found', async () => {
    const wrapper = mountSearch({ groups: [], answered: 'zz-none', query: 'zz-none' })
    await wrapper.get('input').trigger('focus')
    expect(wrapper.text()).toContain('Nothing found for “zz-none”')
    wrapper.unmount()
  })
})
