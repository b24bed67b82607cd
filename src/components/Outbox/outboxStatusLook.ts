import type { EmailStatus } from '@shared/schemas/outbox'

/** How each status reads: a word, a mark and a hint, so nobody has to tell the tags apart by colour. */
export const EMAIL_STATUS_LOOK: Record<EmailStatus, { label: string; mark: string; hint: string }> =
  {
    draft: {
      label: 'Draft',
      mark: '✎',
      hint: 'Prepared for review; not sent until someone sends it',
    },
    queued: { label: 'Queued', mark: '…', hint: 'Waiting for the mail worker' },
    sent: { label: 'Sent', mark: '✓', hint: 'Handed to the mail server' },
    failed: { label: 'Failed', mark: '✕', hint: 'Given up after the last retry' },
    received: {
      label: 'Received',
      mark: '↓',
      hint: 'Mail Waymark did not send, caught by the local mail server',
    },
  }
