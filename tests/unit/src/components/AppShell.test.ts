import { mount, RouterLinkStub } from '@vue/test-utils'
import { describe, expect, it } from 'vitest'
import { areasForRole } from '@shared/areas'
import AppShell from '@/components/AppShell.vue'

function mountShell(role: 'admin' | 'operator') {
  return mount(AppShell, {
    props: { areas: areasForRole(role), userName: 'Ada Winder', roleLabel: 'Operator' },
    slots: { default: '<p class="page">page</p>' },
    global: { stubs: { RouterLink: RouterLinkStub } },
  })
}

describe('AppShell', () => {
  it('links exactly the areas it is given, and the person to their profile', () => {
    const links = mountShell('admin')
      .findAllComponents(RouterLinkStub)
      .map((l) => l.props('to'))
    expect(links).toEqual(['/', ...areasForRole('admin').map((a) => a.path), '/profile'])
  })

  it('shows no Users link to an operator', () => {
    expect(mountShell('operator').find('nav').text()).not.toContain('Users')
  })

  it('shows who is signed in and renders the page', () => {
    const wrapper = mountShell('operator')
    expect(wrapper.text()).toContain('Ada Winder')
    expect(wrapper.find('.page').exists()).toBe(true)
  })

  it('emits signOut from the Sign out button', async () => {
    const wrapper = mountShell('admin')
    await wrapper.get('button').trigger('click')
    expect(wrapper.emitted('signOut')).toHaveLength(1)
  })
})
