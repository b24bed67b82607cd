import type { OpenReturnDto } from '@shared/schemas/shipping'
import { ApiError } from '@/api/client'
import { confirmAction } from '@/composables/confirmAction'

/**
 * Asks for a certificate with `issue(false)`; when the server refuses because a unit has a
 * return open (409 `open_return`), names the returns and asks the person before
 * `issue(true)`. Any other error is thrown as it came.
 * @returns false when the person chose not to issue
 */
export async function certifyDespiteReturns(
  issue: (confirmOpenReturn: boolean) => Promise<unknown>,
): Promise<boolean> {
  try {
    await issue(false)
    return true
  } catch (error) {
    if (!(error instanceof ApiError) || error.code !== 'open_return') throw error
    const open = (error.details as { openReturns?: OpenReturnDto[] }).openReturns ?? []
    const message =
      open.length === 1
        ? `Unit ${open[0]!.serial} has open return ${open[0]!.number}; issue anyway?`
        : `These units have open returns: ${open.map((r) => `${r.serial} (${r.number})`).join(', ')}. Issue anyway?`
    const isSure = await confirmAction(message, 'Open return', 'Issue anyway')
    if (!isSure) return false
    await issue(true)
    return true
  }
}
