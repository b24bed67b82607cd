import { mount } from '@vue/test-utils'
import { describe, expect, it } from 'vitest'
import type { EmailDto } from '@shared/schemas/outbox'
import OutboxEmailDetail from '@/components/Outbox/OutboxEmailDetail.vue'

function email(overrides: Partial<EmailDto> = {}): EmailDto {
  return {
    id: '6f1c2b8e-4d3a-4c1e-9b7a-2e5d8c0f1a23',
    direction: 'out',
    status: 'sent',
    to: ['buyer@example.com', 'qa@example.com'],
    from: 'waymark@example.com',
    subject: 'Lot L-0042 released',
    attachmentCount: 1,
    attempts: 1,
    error: null,
    related: null,
    createdAt: '2026-03-04T14:05:00.000Z',
    sentAt: '2026-03-04T14:05:09.000Z',
    receiptAt: null,
    text: 'Hello,\nthe lot is released.',
    html: null,
    messageId: '<abc@example.com>',
    attachments: [{ filename: 'coc.pdf', contentType: 'application/pdf', size: 2048 }],
    ...overrides,
  }
}

const url = (index: number) => `/api/outbox/x/attachments/${index}`

describe('OutboxEmailDetail', () => {
  it('shows from, to and subject, and keeps the line breaks of the text', () => {
    const wrapper = mount(OutboxEmailDetail, { props: { email: email(), attachmentUrl: url } })
    expect(wrapper.find('.mail__from').text()).toBe('waymark@example.com')
    expect(wrapper.find('.mail__to').text()).toBe('buyer@example.com, qa@example.com')
    expect(wrapper.find('.mail__subject').text()).toBe('Lot L-0042 released')
    expect(wrapper.find('pre.mail__text').element.textContent).toBe('Hello,\nthe lot is released.')
  })

  it('shows an HTML part as its source, never as markup', () => {
    const html = '<p onclick="x()">Hi <img src=x onerror="alert(1)"></p>'
    const wrapper = mount(OutboxEmailDetail, {
      props: { email: email({ text: '', html }), attachmentUrl: url },
    })
    expect(wrapper.find('img').exists()).toBe(false)
    expect(wrapper.find('details pre').text()).toBe(html)
    expect(wrapper.find('details').attributes('open')).toBeDefined()
  })

  it('shows the delivery receipt of a sent e-mail, or that there is none yet', () => {
    const none = mount(OutboxEmailDetail, { props: { email: email(), attachmentUrl: url } })
    expect(none.find('[data-test="receipt"]').text()).toBe('none yet')
    const filed = mount(OutboxEmailDetail, {
      props: { email: email({ receiptAt: '2026-03-04T14:05:10.000Z' }), attachmentUrl: url },
    })
    expect(filed.find('[data-test="receipt"]').text()).toMatch(/^✓ filed by the mail server /)
    const caught = mount(OutboxEmailDetail, {
      props: { email: email({ status: 'received' }), attachmentUrl: url },
    })
    expect(caught.find('[data-test="receipt"]').exists()).toBe(false)
  })

  it('links each attachment to its download address', () => {
    const wrapper = mount(OutboxEmailDetail, { props: { email: email(), attachmentUrl: url } })
    const link = wrapper.find('.mail__attachments a')
    expect(link.attributes('href')).toBe('/api/outbox/x/attachments/0')
    expect(link.text()).toBe('coc.pdf')
    expect(wrapper.find('.mail__attachments').text()).toContain('2 KB')
  })

  it('shows why a failed e-mail was not delivered', () => {
    const wrapper = mount(OutboxEmailDetail, {
      props: {
        email: email({
          status: 'failed',
          attempts: 5,
          error: '550 mailbox unavailable',
          sentAt: null,
        }),
        attachmentUrl: url,
      },
    })
    const error = wrapper.find('.mail__error')
    expect(error.text()).toContain('after 5 attempts')
    expect(error.text()).toContain('550 mailbox unavailable')
  })

  it('has no error block when nothing went wrong', () => {
    const wrapper = mount(OutboxEmailDetail, { props: { email: email(), attachmentUrl: url } })
    expect(wrapper.find('.mail__error').exists()).toBe(false)
  })
})
