import { flushPromises, mount } from '@vue/test-utils'
import { defineComponent, h, reactive } from 'vue'
import { ElFormItem } from 'element-plus'
import { describe, expect, it } from 'vitest'
import { z } from 'zod'
import FormDialog from '@/components/FormDialog.vue'
import { useZodRules } from '@/composables/useZodRules'

const Input = z.object({ name: z.string().trim().min(1, 'enter a name') })

/** A dialog as the screens write one: a form, zod rules and one form item in the slot. */
function mountDialog(isOpen = false) {
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
})
