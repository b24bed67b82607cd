import { flushPromises, mount } from '@vue/test-utils'
import { defineComponent, h, reactive } from 'vue'
import { ElFormItem } from 'element-plus'
import { describe, expect, it } from 'vitest'
import { z } from 'zod'
import FormDialog from '@/components/FormDialog.vue'
import { ApiError } from '@/api/client'
import { useEditDialog } from '@/composables/useEditDialog'
import { useZodRules } from '@/composables/useZodRules'

const Input = z.object({ name: z.string().trim().min(1, 'enter a name') })

/** A dialog as the screens write one: a form, zod rules and one form item in the slot. */
function mountDialog(isOpen = false, extra: Record<string, unknown> = {}) {
  const events: string[] = []
  const form = reactive({ name: '' })
  const Host = defineComponent({
    props: { isOpen: { type: Boolean, required: true } },
    setup(props) {
      const rules = useZodRules(Input)
      return () =>
        h(
          FormDialog,
          {
            modelValue: props.isOpen,
            title: 'New thing',
            model: form,
            rules,
            isSaving: false,
            submitLabel: 'Add thing',
            onOpen: () => events.push('open'),
            onSubmit: () => events.push('submit'),
            ...extra,
          },
          { default: () => h(ElFormItem, { label: 'Name', prop: 'name' }, () => form.name) },
        )
    },
  })
  const wrapper = mount(Host, { props: { isOpen }, attachTo: document.body })
  return { wrapper, events, form }
}

const primary = () =>
  [...document.querySelectorAll('.el-dialog__footer button')].find((b) =>
    b.textContent?.includes('Add thing'),
  ) as HTMLButtonElement

describe('FormDialog', () => {
  it('asks its parent to fill the form each time it opens, and shows title and button', async () => {
    const { wrapper, events } = mountDialog()
    expect(events).toEqual([])
    await wrapper.setProps({ isOpen: true })
    await flushPromises()
    expect(events).toEqual(['open'])
    expect(document.querySelector('.el-dialog__title')?.textContent).toBe('New thing')
    expect(primary()).toBeTruthy()
    wrapper.unmount()
  })

  // NOTE: Element Plus's rule checks pass every value under happy-dom (a bare ElForm does the
  // same), so the rules' refusal is left to the e2e tests, which drive a real browser.
  it('submits the filled form from the primary button, and Cancel closes it', async () => {
    const { wrapper, events, form } = mountDialog(true)
    await flushPromises()
    form.name = 'Winding bench'
    primary().click()
    await flushPromises()
    expect(events).toEqual(['submit'])

    const cancel = [...document.querySelectorAll('.el-dialog__footer button')].find(
      (b) => b.textContent?.trim() === 'Cancel',
    ) as HTMLButtonElement
    cancel.click()
    await flushPromises()
    expect(wrapper.findComponent(FormDialog).emitted('update:modelValue')).toEqual([[false]])
    wrapper.unmount()
  })

  it('offers only Close, and never submits, when there is nothing to submit', async () => {
    const { wrapper, events } = mountDialog(true, { hasSubmit: false })
    await flushPromises()
    const buttons = [...document.querySelectorAll('.el-dialog__footer button')]
    expect(buttons.map((b) => b.textContent?.trim())).toEqual(['Close'])
    // Enter in a field submits the form; with nothing to submit it must not reach the parent.
    document.querySelector('.el-dialog form')?.dispatchEvent(new Event('submit'))
    await flushPromises()
    expect(events).toEqual([])
    wrapper.unmount()
  })

  it('takes open and saving from one useEditDialog state, and Cancel closes that state', async () => {
    let finishSave = () => {}
    const saved: string[] = []
    const form = reactive({ name: 'Hipot tester' })
    const dialog = useEditDialog<{ name: string }, string>(
      (_target, input) =>
        new Promise<void>((resolve) => {
          saved.push(input)
          finishSave = resolve
        }),
      () => 'Saved',
    )
    const wrapper = mount(FormDialog, {
      props: {
        dialog,
        title: 'Edit thing',
        model: form,
        submitLabel: 'Add thing',
        onSubmit: () => dialog.submit(form.name),
      },
      slots: { default: () => h(ElFormItem, { label: 'Name', prop: 'name' }, () => form.name) },
      attachTo: document.body,
    })
    expect(document.querySelector('.el-dialog')).toBeNull()

    dialog.open({ name: 'Hipot tester' })
    await flushPromises()
    expect(document.querySelector('.el-dialog__title')?.textContent).toBe('Edit thing')
    primary().click()
    await flushPromises()
    expect(saved).toEqual(['Hipot tester'])
    // The primary button spins while the dialog's save runs, and the dialog closes after it.
    expect(primary().classList.contains('is-loading')).toBe(true)
    finishSave()
    await flushPromises()
    expect(dialog.isOpen).toBe(false)

    dialog.open(null)
    await flushPromises()
    expect(dialog.isOpen).toBe(true)
    const cancel = [...document.querySelectorAll('.el-dialog__footer button')].find(
      (b) => b.textContent?.trim() === 'Cancel',
    ) as HTMLButtonElement
    cancel.click()
    await flushPromises()
    expect(dialog.isOpen).toBe(false)
    expect(saved).toEqual(['Hipot tester'])
    wrapper.unmount()
  })

  it('lists every field message when asked, and asks for the success words after the save', async () => {
    let saved = 0
    const dialog = useEditDialog<null, string>(
      async () => {
        saved += 1
        if (saved === 1)
          throw new ApiError(400, 'validation_failed', 'bad', { reason: 'too short' })
      },
      () => `saved ${saved} time(s)`,
    )
    const form = reactive({ reason: '' })
    const wrapper = mount(FormDialog, {
      props: {
        dialog,
        title: 'Contain',
        model: form,
        submitLabel: 'Hold',
        submitTest: 'hold-confirm',
        isListingErrors: true,
        onSubmit: () => dialog.submit(form.reason),
      },
      attachTo: document.body,
    })
    dialog.open(null)
    await flushPromises()
    const button = document.querySelector('[data-test=hold-confirm]') as HTMLButtonElement
    button.click()
    await flushPromises()
    expect(document.querySelector('.form-dialog__error')?.textContent?.trim()).toBe('Too short')
    expect(dialog.isOpen).toBe(true)

    button.click()
    await flushPromises()
    expect(dialog.isOpen).toBe(false)
    const messages = [...document.querySelectorAll('.el-message')].map((m) => m.textContent)
    expect(messages).toContain('saved 2 time(s)')
    wrapper.unmount()
  })
})
