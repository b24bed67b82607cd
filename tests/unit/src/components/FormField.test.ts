import { flushPromises, mount } from '@vue/test-utils'
import { defineComponent, h, reactive } from 'vue'
import { describe, expect, it } from 'vitest'
import FormDialog from '@/components/FormDialog.vue'
import FormField from '@/components/FormField.vue'
import NumberInput from '@/components/NumberInput.vue'
import { provideFormFields } from '@/components/formFields'

/** A dialog holding the fields `slot` draws, open from the start. */
function mountDialog(
  form: Record<string, unknown>,
  errors: Record<string, string>,
  slot: () => ReturnType<typeof h>[],
) {
  return mount(FormDialog, {
    props: { modelValue: true, title: 'Thing', model: form, submitLabel: 'Save', errors },
    slots: { default: slot },
    attachTo: document.body,
  })
}

const itemOf = (label: string) =>
  [...document.querySelectorAll('.el-form-item')].find(
    (item) => item.querySelector('.el-form-item__label')?.textContent === label,
  )!

/** Element Plus shows a form item's message after a 100 ms debounce; wait for it. */
async function messageOf(label: string) {
  const deadline = Date.now() + 2000
  while (Date.now() < deadline) {
    const text = itemOf(label).querySelector('.el-form-item__error')?.textContent?.trim()
    if (text) return text
    await new Promise((resolve) => requestAnimationFrame(resolve))
  }
  return ''
}

describe('FormField', () => {
  it('shows the message its dialog holds for its prop, and none on other fields', async () => {
    const form = reactive({ code: '', name: '' })
    const wrapper = mountDialog(form, { code: 'This code is taken' }, () => [
      h(FormField, { label: 'Code', prop: 'code' }),
      h(FormField, { label: 'Name', prop: 'name' }),
    ])
    await flushPromises()
    expect(await messageOf('Code')).toBe('This code is taken')
    expect(itemOf('Name').classList.contains('is-error')).toBe(false)
    wrapper.unmount()
  })

  it('with options is a select on the model at its prop, showing the chosen label', async () => {
    const form = reactive({ kind: 'winding' as string | null })
    const wrapper = mountDialog(form, {}, () => [
      h(FormField, {
        label: 'Kind',
        prop: 'kind',
        options: [
          { value: 'winding', label: 'Winding' },
          { value: 'hipot', label: 'Hipot' },
        ],
      }),
    ])
    await flushPromises()
    expect(itemOf('Kind').querySelector('.el-select')?.textContent).toContain('Winding')
    const select = wrapper.findComponent({ name: 'ElSelect' })
    select.vm.$emit('update:modelValue', 'hipot')
    await flushPromises()
    expect(form.kind).toBe('hipot')
    wrapper.unmount()
  })

  it('without content is a text input on the model at its prop, upper-cased when asked', async () => {
    const form = reactive({ code: 'wind-01', note: 'first' })
    const wrapper = mountDialog(form, {}, () => [
      h(FormField, { label: 'Code', prop: 'code', isUpperCase: true, placeholder: 'e.g. X' }),
      h(FormField, { label: 'Note', prop: 'note', rows: 3 }),
    ])
    await flushPromises()
    const code = itemOf('Code').querySelector('input')!
    expect(code.value).toBe('wind-01')
    expect(code.placeholder).toBe('e.g. X')
    code.value = 'wind-02'
    code.dispatchEvent(new Event('input'))
    await flushPromises()
    expect(form.code).toBe('WIND-02')

    const note = itemOf('Note').querySelector('textarea')!
    expect(note.getAttribute('rows')).toBe('3')
    note.value = 'second'
    note.dispatchEvent(new Event('input'))
    await flushPromises()
    expect(form.note).toBe('second')
    wrapper.unmount()
  })

  it('shows a hint under the input, and takes its context from a form outside a dialog', async () => {
    const form = reactive({ serial: '' })
    const Host = defineComponent({
      setup() {
        provideFormFields(() => ({ model: form, errors: { serial: 'No unit has this serial' } }))
        return () => h(FormField, { label: 'Serial', prop: 'serial', hint: 'scan the label' })
      },
    })
    const wrapper = mount(Host, { attachTo: document.body })
    await flushPromises()
    expect(itemOf('Serial').querySelector('.form-field__hint')?.textContent).toBe('scan the label')
    expect(await messageOf('Serial')).toBe('No unit has this serial')
    wrapper.unmount()
  })
})

describe('NumberInput', () => {
  it('gives null, not undefined, when emptied, and the number typed otherwise', async () => {
    const values: (number | null)[] = []
    const wrapper = mount(NumberInput, {
      props: { modelValue: 4, 'onUpdate:modelValue': (v: number | null) => values.push(v) },
    })
    const input = wrapper.find('input')
    await input.setValue('')
    await input.trigger('change')
    await input.setValue('7')
    await input.trigger('change')
    expect(values).toContain(null)
    expect(values).not.toContain(undefined)
    expect(values.at(-1)).toBe(7)
    wrapper.unmount()
  })
})
