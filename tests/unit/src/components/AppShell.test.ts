import { mount, RouterLinkStub } from '@vue/test-utils'
import { describe, expect, it } from 'vitest'
import { areasForRole } from '@shared/areas'
import AppShell from '@/components/AppShell.vue'

function mountShell(role: 'admin' | 'operator') {
  return mount(AppShell, {
    props: { areas: areasForRole(role), userName: 'Ada Winder', roleLabel: 'Operator' },
    slots: { default: '<p class="page">page</p>' },
    global: { stubs: { RouterLink: RouterLinkStub, teleport: true } },
    attachTo: document.body,
  })
}

/** The paths linked inside one element of the shell. */
function pathsIn(wrapper: ReturnType<typeof mountShell>, selector: string): unknown[] {
  const inside = wrapper.get(selector).element
  return wrapper
    .findAllComponents(RouterLinkStub)
    .filter((l) => inside.contains(l.element))
    .map((l) => l.props('to'))
}

describe('AppShell', () => {
  it('links exactly the areas it is given, and the person to their profile', () => {
    const wrapper = mountShell('admin')
    expect(pathsIn(wrapper, 'nav[aria-label="Areas"]')).toEqual(
      areasForRole('admin').map((a) => a.path),
    )
    expect(pathsIn(wrapper, 'header')).toEqual(['/', '/profile'])
    wrapper.unmount()
  })

  it('shows no Users link to an operator', () => {
    const wrapper = mountShell('operator')
    expect(wrapper.find('nav').text()).not.toContain('Users')
    wrapper.unmount()
  })

  it('shows who is signed in and renders the page', () => {
    const wrapper = mountShell('operator')
    expect(wrapper.text()).toContain('Ada Winder')
    expect(wrapper.find('.page').exists()).toBe(true)
    wrapper.unmount()
  })

  it('emits signOut from the Sign out button', async () => {
    const wrapper = mountShell('admin')
    await wrapper.get('.app-shell__signout').trigger('click')
    expect(wrapper.emitted('signOut')).toHaveLength(1)
    wrapper.unmount()
  })

  it('opens the menu with the same areas, and closes it when one is taken', async () => {
    const wrapper = mountShell('admin')
    const button = wrapper.get('[data-test=menu-button]')
    expect(button.attributes('aria-expanded')).toBe('false')
    await button.trigger('click')
    expect(button.attributes('aria-expanded')).toBe('true')
    expect(pathsIn(wrapper, 'nav[aria-label="Menu"]')).toEqual(
      areasForRole('admin').map((a) => a.path),
    )
    await wrapper.get('nav[aria-label="Menu"] a').trigger('click')
    expect(button.attributes('aria-expanded')).toBe('false')
    wrapper.unmount()
  })

  it('signs out from the menu too', async () => {
    const wrapper = mountShell('operator')
    await wrapper.get('[data-test=menu-button]').trigger('click')
    await wrapper.get('.shell-menu__signout').trigger('click')
    expect(wrapper.emitted('signOut')).toHaveLength(1)
    wrapper.unmount()
  })
})
