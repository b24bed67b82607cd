import { mount, RouterLinkStub } from '@vue/test-utils'
import { ElButton } from 'element-plus'
import { describe, expect, it } from 'vitest'
import PageHead from '@/components/PageHead.vue'

const stubs = { RouterLink: RouterLinkStub }

describe('PageHead', () => {
  it('renders the title, the lead and the actions in the page classes', () => {
    const wrapper = mount(PageHead, {
      props: { title: 'Stations' },
      slots: { default: 'Benches and testers.', actions: '<button>New station</button>' },
      global: { stubs },
    })
    expect(wrapper.classes()).toEqual(['wm-page__head'])
    expect(wrapper.get('h1.wm-page__title').text()).toBe('Stations')
    expect(wrapper.get('p.wm-page__lead').text()).toBe('Benches and testers.')
    expect(wrapper.get('button').text()).toBe('New station')
    expect(wrapper.findComponent(RouterLinkStub).exists()).toBe(false)
  })

  it('leaves out the lead when there is none, and shows a link back when given', () => {
    const wrapper = mount(PageHead, {
      props: { title: 'Parts', back: { to: '/receiving', label: 'Receiving' } },
      global: { stubs },
    })
    expect(wrapper.find('p').exists()).toBe(false)
    const back = wrapper.getComponent(RouterLinkStub)
    expect(back.props('to')).toBe('/receiving')
    expect(back.text()).toBe('← Receiving')
    expect(back.classes()).toContain('wm-page__back')
  })

  it('offers the add button to a user who may add, and says when it is pressed', async () => {
    const head = mount(PageHead, {
      props: { title: 'Parts', create: 'New part' },
      global: { stubs },
    })
    const button = head.findComponent(ElButton)
    expect(button.text()).toBe('New part')
    expect(button.props('type')).toBe('primary')
    await button.trigger('click')
    expect(head.emitted('create')).toHaveLength(1)
  })

  it('shows no add button to a user who may not add', () => {
    const head = mount(PageHead, { props: { title: 'Parts', create: false }, global: { stubs } })
    expect(head.findComponent(ElButton).exists()).toBe(false)
  })

  it('shows the page’s own buttons in place of the add button', () => {
    const head = mount(PageHead, {
      props: { title: 'Receiving', create: 'New part' },
      slots: { actions: '<a class="own">Parts</a>' },
      global: { stubs },
    })
    expect(head.find('.own').exists()).toBe(true)
    expect(head.findComponent(ElButton).exists()).toBe(false)
  })
})
