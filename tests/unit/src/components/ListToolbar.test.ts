import { mount } from '@vue/test-utils'
import { ElInput } from 'element-plus'
import { describe, expect, it } from 'vitest'
import { ref } from 'vue'
import ListToolbar from '@/components/ListToolbar.vue'
import { useTextFilter } from '@/composables/useTextFilter'

const base = { modelValue: '', placeholder: 'Search code or name', width: 260 }

describe('ListToolbar', () => {
  it('narrows a list held in the browser as one types: no form, no Search button', async () => {
    const bar = mount(ListToolbar, { props: { ...base, count: '3 of 12 stations' } })
    expect(bar.element.tagName).toBe('DIV')
    expect(bar.find('button').exists()).toBe(false)
    expect(bar.text()).toContain('3 of 12 stations')
    await bar.findComponent(ElInput).setValue('wind')
    expect(bar.emitted('update:modelValue')).toEqual([['wind']])
  })

  it('asks a server-searched list for the first page on Search, Enter and clearing', async () => {
    let searches = 0
    const bar = mount(ListToolbar, {
      props: { ...base, modelValue: 'PSU', onSearch: () => searches++ },
      attrs: { 'aria-label': 'Record' },
    })
    expect(bar.element.tagName).toBe('FORM')
    expect(bar.find('button[type="submit"]').text()).toBe('Search')
    expect(bar.find('input').attributes('aria-label')).toBe('Record')
    await bar.find('form').trigger('submit')
    bar.findComponent(ElInput).vm.$emit('clear')
    expect(searches).toBe(2)
  })
})

describe('useTextFilter', () => {
  const rows = ref([
    { code: 'WND-01', name: 'Winding bench', kind: 'winding' },
    { code: 'HIP-01', name: 'Hipot tester', kind: 'hipot' },
  ])

  it('keeps the rows whose words hold the text, in any case, ends trimmed', () => {
    const { text, shown } = useTextFilter(rows, (s) => `${s.code}\n${s.name}`)
    expect(shown.value).toHaveLength(2)
    text.value = '  hipot '
    expect(shown.value.map((s) => s.code)).toEqual(['HIP-01'])
    // Fields joined with a line break are matched one by one, never across the break.
    text.value = '01 winding'
    expect(shown.value).toEqual([])
  })

  it('applies the page’s other filters as well', () => {
    const kind = ref('')
    const { text, shown } = useTextFilter(
      rows,
      (s) => s.name,
      (s) => !kind.value || s.kind === kind.value,
    )
    kind.value = 'winding'
    expect(shown.value.map((s) => s.code)).toEqual(['WND-01'])
    text.value = 'hipot'
    expect(shown.value).toEqual([])
  })
})
