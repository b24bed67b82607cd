import { describe, expect, it } from 'vitest'
import { useRecordForm } from '@/composables/useRecordForm'

describe('useRecordForm', () => {
  const empty = () => ({ name: '', turns: null as number | null, kinds: [] as string[], on: true })

  it('starts empty, fills from a record, and empties again for a new one', () => {
    const { form, fill } = useRecordForm(empty)
    expect(form).toEqual({ name: '', turns: null, kinds: [], on: true })
    fill({ name: 'primary', turns: 42, kinds: ['winding'], on: false })
    expect(form).toEqual({ name: 'primary', turns: 42, kinds: ['winding'], on: false })
    fill(null)
    expect(form).toEqual({ name: '', turns: null, kinds: [], on: true })
  })

  it('keeps only its own keys, takes the empty value for a null one, and copies arrays', () => {
    const { form, fill } = useRecordForm(empty)
    const kinds = ['hipot']
    const record = { id: 'x1', name: null, turns: 7, kinds, on: false }
    fill(record)
    expect(form).toEqual({ name: '', turns: 7, kinds: ['hipot'], on: false })
    form.kinds.push('load')
    expect(kinds).toEqual(['hipot'])
  })
})
