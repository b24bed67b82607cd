import { mount } from '@vue/test-utils'
import { describe, expect, it } from 'vitest'
import OutboxStatusTag from '@/components/Outbox/OutboxStatusTag.vue'

describe('OutboxStatusTag', () => {
  it('names each status in words with its own mark, not by colour alone', () => {
    const statuses = ['queued', 'sent', 'failed', 'received'] as const
    const tags = statuses.map((status) => mount(OutboxStatusTag, { props: { status } }))
    expect(tags.map((t) => t.text())).toEqual(['… Queued', '✓ Sent', '✕ Failed', '↓ Received'])
    expect(new Set(tags.map((t) => t.find('.mail-status__mark').text())).size).toBe(4)
    expect(tags[2]!.classes()).toContain('mail-status--failed')
  })
})
