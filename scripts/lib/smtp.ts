import { fakeSpec, fakeState, startFake, stopFake } from './fakeProcess'
import type { FakeSpec } from './fakeProcess'
import type { ServiceState } from './postgres'
import type { ServiceConfig } from './serviceConfig'
import { serviceEnv } from './serviceConfig'

type Log = (line: string) => void

// The fake files mail in the database named by the caller's WAYMARK_DB (waymark by default).
const database = () => process.env.WAYMARK_DB || 'waymark'

function spec(config: ServiceConfig): FakeSpec {
  return fakeSpec(config, 'smtp', {
    portVariable: 'WAYMARK_SMTP_PORT',
    env: { ...process.env, ...serviceEnv(config), WAYMARK_DB: database() },
  })
}

/** Runs the SMTP fake in the background, unless SMTP_URL points at a real relay. */
export async function startSmtp(config: ServiceConfig, log: Log): Promise<void> {
  if (config.isSmtpExternal) {
    log('smtp: using SMTP_URL (no local fake)')
    return
  }
  if (await startFake(spec(config), log))
    log(`smtp: started on ${config.host}:${config.smtpPort}; files mail into ${database()}`)
}

/** Stops the fake named in our pid file. */
export async function stopSmtp(config: ServiceConfig, log: Log): Promise<void> {
  if (!config.isSmtpExternal) await stopFake(spec(config), log)
}

export function smtpState(config: ServiceConfig): ServiceState {
  if (config.isSmtpExternal)
    return { name: 'smtp', isRunning: true, port: config.smtpPort, pid: null, note: 'SMTP_URL' }
  return fakeState(spec(config))
}
