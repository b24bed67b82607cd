import { ElMessageBox } from 'element-plus'

/**
 * Asks before an action that cannot be undone from this screen.
 * @returns true when the person confirmed
 */
export async function confirmAction(
  message: string,
  title: string,
  confirmButtonText: string,
  isDanger = true,
) {
  try {
    await ElMessageBox.confirm(message, title, {
      confirmButtonText,
      cancelButtonText: 'Cancel',
      type: isDanger ? 'warning' : 'info',
      confirmButtonClass: isDanger ? 'el-button--danger' : undefined,
      autofocus: false,
    })
    return true
  } catch {
    return false
  }
}
