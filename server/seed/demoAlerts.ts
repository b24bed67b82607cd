import { evaluateLotStep, sendDueDigests } from '../services/quality'

// The alerts of the demo's past, judged as the alerts worker judges them after each scan, but
// at the story's time: each alert, its audit rows and the e-mails to the leads are stamped when
// the story raised them, not when the seed ran. A lead's digest is sent when its window is over
// in story time, as the worker's delayed job would have sent it.

export class DemoAlerts {
  /** Alerts raised so far. */
  raised = 0
  /** When each lead's waiting digest is due. */
  private readonly due = new Map<string, Date>()

  /** Judges one lot's step after a step run recorded at `at`. */
  async afterRun(lotId: string, stepId: string, at: Date): Promise<void> {
    await this.sendDigestsDue(at)
    const { raised, digests } = await evaluateLotStep(lotId, stepId, at)
    this.raised += raised
    this.schedule(digests)
  }

  /** Sends every digest due by `until`, each at its own due time, oldest first. */
  async sendDigestsDue(until: Date): Promise<void> {
    for (;;) {
      const next = [...this.due.entries()]
        .filter(([, at]) => at <= until)
        .sort((a, b) => a[1].getTime() - b[1].getTime())[0]
      if (!next) return
      this.due.delete(next[0])
      const { later } = await sendDueDigests(next[1])
      this.schedule(later)
    }
  }

  private schedule(digests: { leadId: string; dueAt: Date }[]): void {
    for (const d of digests) {
      const known = this.due.get(d.leadId)
      if (!known || d.dueAt < known) this.due.set(d.leadId, d.dueAt)
    }
  }
}
