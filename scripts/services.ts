// CLI for the local PostgreSQL, Redis, S3 fake and SMTP fake: `tsx scripts/services.ts start|stop|status`.
import { ServiceError } from './lib/proc'
import { serviceConfig } from './lib/serviceConfig'
import { servicesStatus, startServices, stopServices } from './lib/services'

const HELP = `usage: npm run services -- <start|stop|status>

  start   install missing Debian packages (as root), start PostgreSQL, Redis, the S3
          fake and the SMTP fake on 127.0.0.1, create roles, databases and buckets
          (idempotent)
  stop    stop the servers started by 'start' (found by their pid files)
  status  one line per service; exit 0 when all run, 3 otherwise

environment (defaults):
  WAYMARK_DATA_DIR    /var/tmp/waymark (root) or /var/tmp/waymark-$USER
  WAYMARK_PG_PORT     55432
  WAYMARK_REDIS_PORT  56379
  WAYMARK_S3_PORT     56569
  S3_ENDPOINT         unset: run the local fake; set: use that store instead
  WAYMARK_SMTP_PORT   2526
  SMTP_URL            unset: run the local SMTP fake, which files mail into the
                      database WAYMARK_DB (waymark); set: the app sends there instead

secrets: $WAYMARK_DATA_DIR/secrets/db.json and session-secret (mode 0600)`

async function main(argv: string[]): Promise<number> {
  const command = argv[0]
  if (!command || argv.includes('--help') || argv.includes('-h')) {
    console.log(HELP)
    return command ? 0 : 2
  }
  switch (command) {
    case 'start':
      await startServices()
      return 0
    case 'stop':
      await stopServices()
      return 0
    case 'status': {
      const config = serviceConfig()
      const states = servicesStatus(config)
      console.log(`data: ${config.dataDir}`)
      for (const s of states) {
        const state = s.isRunning ? 'running' : 'stopped'
        console.log(
          `${s.name}: ${state}, port ${s.port}, pid ${s.pid ?? '-'}${s.note ? ` (${s.note})` : ''}`,
        )
      }
      return states.every((s) => s.isRunning) ? 0 : 3
    }
    default:
      console.error(`unknown command "${command}"\n\n${HELP}`)
      return 2
  }
}

main(process.argv.slice(2)).then(
  (code) => process.exit(code),
  (err: unknown) => {
    console.error(err instanceof ServiceError ? `services: ${err.message}` : err)
    process.exit(1)
  },
)
