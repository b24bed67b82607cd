import { describe, expect, it } from 'vitest'
import type { SearchHitDto } from '@shared/schemas/search'
import { searchHitRoute } from '@/composables/useGlobalSearch'

const hit = (kind: SearchHitDto['kind']) =>
  ({ kind, id: 'c0ffee00-0000-4000-8000-000000000001', ref: 'REF-7' }) as SearchHitDto

describe('searchHitRoute', () => {
  // The route names and query keys are the ones src/router/index.ts and each screen read.
  it.each([
    ['unit', { name: 'trace', query: { serial: 'REF-7' } }],
    ['lot', { name: 'lot', params: { id: hit('lot').id } }],
    ['componentLot', { name: 'componentLots', query: { q: 'REF-7' } }],
    ['customer', { name: 'customers', query: { open: hit('customer').id } }],
    ['revision', { name: 'revision', params: { id: hit('revision').id } }],
    ['shipment', { name: 'shipping', query: { open: hit('shipment').id } }],
    ['serviceCase', { name: 'service', query: { open: hit('serviceCase').id } }],
  ] as const)('opens a %s where its screen shows it', (kind, route) => {
    expect(searchHitRoute(hit(kind))).toEqual(route)
  })
})
