import { flushPromises, mount } from '@vue/test-utils'
import { describe, expect, it } from 'vitest'
import { reactive } from 'vue'
import StationFormDialog from '@/components/StationFormDialog.vue'
import { useEditDialog } from '@/composables/useEditDialog'
import { z } from 'zod'
import { useFormDialog } from '@/composables/useFormDialog'
import type { FormDialogState } from '@/composables/useFormDialog'
import { useZodRules } from '@/composables/useZodRules'
import type { StationCreateInput, StationDto } from '@shared/schemas/stations'

const Input = z.object({ name: z.string().trim().min(1), turns: z.number().int().nullable() })
type Input = z.infer<typeof Input>
type Row = { id: string; name: string; turns: number | null }

/** A dialog state as useEditDialog gives it, recording what it was asked to save. */
function dialogState(target: Row | null) {
  const saved: Input[] = []
  const state = reactive({
    isOpen: true,
    isSaving: false,
    target,
    close: () => undefined,
    submit: (input: Input) => saved.push(input),
  }) as FormDialogState<Row, Input>
  return { state, saved }
}

describe('useFormDialog', () => {
  const empty = () => ({ name: '', turns: null as number | null })

  it('fills the form from the target on opening and submits what toInput makes of it', () => {
    const { state, saved } = dialogState({ id: 'w1', name: 'primary', turns: 42 })
    const { form, bind } = useFormDialog(
      () => state,
      empty,
      (input) => Input.parse(input),
    )
    bind.value.onOpen()
    expect(form).toEqual({ name: 'primary', turns: 42 })
    form.name = '  secondary '
    bind.value.onSubmit()
    expect(saved).toEqual([{ name: 'secondary', turns: 42 }])
  })

  it('empties the form for a new record and hands FormDialog the state, model and rules', () => {
    const { state } = dialogState(null)
    const rules = useZodRules(Input)
    const { form, bind } = useFormDialog(
      () => state,
      empty,
      (input) => Input.parse(input),
      rules,
    )
    form.name = 'left over'
    bind.value.onOpen()
    expect(form).toEqual({ name: '', turns: null })
    expect(bind.value.dialog).toBe(state)
    expect(bind.value.model).toBe(form)
    expect(bind.value.rules).toBe(rules)
  })

  it('reads rules given as a function each time, for a create and an update schema', () => {
    const { state } = dialogState(null)
    const createRules = useZodRules(Input)
    const updateRules = useZodRules(Input.pick({ name: true }))
    const { bind } = useFormDialog(
      () => state,
      empty,
      (input) => Input.parse(input),
      () => (state.target ? updateRules : createRules),
    )
    expect(bind.value.rules).toBe(createRules)
    ;(state as { target: Row | null }).target = { id: 'w1', name: 'primary', turns: 1 }
    expect(bind.value.rules).toBe(updateRules)
  })

  it('fills from what `from` makes of the target, where the target is not the form', () => {
    const { state } = dialogState({ id: 'w1', name: 'primary', turns: 42 })
    const { form, bind } = useFormDialog(
      () => state,
      empty,
      (input) => Input.parse(input),
      undefined,
      { from: (row) => ({ name: `copy of ${row?.name}` }) },
    )
    bind.value.onOpen()
    expect(form).toEqual({ name: 'copy of primary', turns: null })
  })

  it('submits only what `confirm` agrees to', async () => {
    const { state, saved } = dialogState(null)
    const asked: Input[] = []
    let isAgreeing = false
    const { form, bind } = useFormDialog(
      () => state,
      empty,
      (input) => Input.parse(input),
      undefined,
      {
        confirm: async (input) => {
          asked.push(input)
          return isAgreeing
        },
      },
    )
    form.name = 'secondary'
    await bind.value.onSubmit()
    expect(asked).toEqual([{ name: 'secondary', turns: null }])
    expect(saved).toEqual([])
    isAgreeing = true
    await bind.value.onSubmit()
    expect(saved).toEqual([{ name: 'secondary', turns: null }])
  })
})

describe('a form dialog wired with useFormDialog (StationFormDialog)', () => {
  it('opens filled from the station, and saves the input as the shared schema parses it', async () => {
    const saved: unknown[] = []
    const dialog = useEditDialog<StationDto, StationCreateInput>(
      async (_target, input) => void saved.push(input),
      () => 'Saved',
    )
    const wrapper = mount(StationFormDialog, { props: { dialog }, attachTo: document.body })
    const station = { id: 's1', code: 'WIND-02', name: 'Winding bench 2', kind: 'winding' as const }
    dialog.open({ ...station, isActive: true, createdAt: '', updatedAt: '' })
    await flushPromises()
    expect(document.querySelector('.el-dialog__title')?.textContent).toBe('Edit station WIND-02')
    const name = document.querySelector<HTMLInputElement>(
      'input[placeholder="e.g. Winding bench 2"]',
    )
    expect(name?.value).toBe('Winding bench 2')
    const save = [...document.querySelectorAll('.el-dialog__footer button')].find((b) =>
      b.textContent?.includes('Save changes'),
    ) as HTMLButtonElement
    save.click()
    await flushPromises()
    expect(saved).toEqual([
      { code: 'WIND-02', name: 'Winding bench 2', kind: 'winding', isActive: true },
    ])
    wrapper.unmount()
  })
})
