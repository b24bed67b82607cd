/** Capitalises a terse server or schema message ("enter a name") for display under a field. */
export function toSentence(message: string): string {
  const text = message.trim()
  return text ? text[0]!.toUpperCase() + text.slice(1) : text
}

const MINUTES: Intl.DateTimeFormatOptions = {
  year: 'numeric',
  month: 'short',
  day: '2-digit',
  hour: '2-digit',
  minute: '2-digit',
}
const minutes = new Intl.DateTimeFormat('en-GB', MINUTES)
const seconds = new Intl.DateTimeFormat('en-GB', { ...MINUTES, second: '2-digit' })

/**
 * "04 Mar 2026, 14:05" in the browser's time zone; an em dash for no value.
 * @param withSeconds for logs, where several events share a minute
 */
export function formatDateTime(iso: string | null | undefined, withSeconds = false): string {
  if (!iso) return '—'
  const date = new Date(iso)
  if (Number.isNaN(date.getTime())) return iso
  return (withSeconds ? seconds : minutes).format(date)
}
