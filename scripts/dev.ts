// `npm run dev`: services, migrations, demo data when empty, then Vite and the API in watch mode.
import { ServiceError } from './lib/proc'
import { serviceEnv } from './lib/serviceConfig'
import { startServices } from './lib/services'
import { bin, prepareDatabase } from './lib/steps'
import { supervise } from './lib/supervise'

const HELP = `usage: npm run dev   (tsx scripts/dev.ts)

Starts the services, migrates "waymark", seeds it when empty, then runs together:
  vite dev server  http://127.0.0.1:4870  (proxies /api to the API)
  API (tsx watch)  http://127.0.0.1:4871  (restarts on server/ and shared/ changes)
Ctrl-C stops both; the services keep running (\`npm run services stop\`).

environment: WAYMARK_DEV_PORT (4870), WAYMARK_API_PORT (4871), plus the service variables`

async function main(argv: string[]): Promise<number> {
  if (argv.includes('--help') || argv.includes('-h')) {
    console.log(HELP)
    return 0
  }
  const { config } = await startServices()
  const devPort = process.env.WAYMARK_DEV_PORT || '4870'
  const apiPort = process.env.WAYMARK_API_PORT || '4871'
  const env: NodeJS.ProcessEnv = {
    ...process.env,
    ...serviceEnv(config),
    WAYMARK_DB: 'waymark',
    NODE_ENV: 'development',
    // vite.config.ts reads this for its /api proxy target.
    WAYMARK_API_PORT: apiPort,
  }
  const prepared = await prepareDatabase(config, env, [], ['--if-empty'])
  if (prepared !== 0) return prepared
  console.log(`\n==> dev: client http://127.0.0.1:${devPort}, API http://127.0.0.1:${apiPort}`)
  return supervise([
    {
      name: 'vite',
      cmd: bin(config, 'vite'),
      args: ['--port', devPort, '--strictPort'],
      cwd: config.repoRoot,
      env,
    },
    {
      name: 'api',
      cmd: bin(config, 'tsx'),
      args: ['watch', '--clear-screen=false', 'server/main/index.ts'],
      cwd: config.repoRoot,
      env: { ...env, PORT: apiPort, HOST: '127.0.0.1' },
    },
  ])
}

main(process.argv.slice(2)).then(
  (code) => process.exit(code),
  (err: unknown) => {
    console.error(err instanceof ServiceError ? `dev: ${err.message}` : err)
    process.exit(1)
  },
)
