// `npm start`: services, migrations, demo data on first start, client build, then the server.
import { ServiceError } from './lib/proc'
import { serviceEnv } from './lib/serviceConfig'
import { startServices } from './lib/services'
import { bin, prepareDatabase, runStep } from './lib/steps'
import { supervise } from './lib/supervise'

const HELP = `usage: npm start   (tsx scripts/start.ts)

Starts PostgreSQL, Redis and the S3 fake (see \`npm run services -- --help\`), migrates the
"waymark" database, loads the demo data when it is empty, builds the client into dist/ and
serves it with the API. Ctrl-C stops the server; the services keep running
(\`npm run services stop\` stops them).

environment: PORT (4870), HOST (127.0.0.1), plus the service variables of scripts/services.ts`

async function main(argv: string[]): Promise<number> {
  if (argv.includes('--help') || argv.includes('-h')) {
    console.log(HELP)
    return 0
  }
  const { config } = await startServices()
  const env: NodeJS.ProcessEnv = { ...process.env, ...serviceEnv(config), WAYMARK_DB: 'waymark' }
  const prepared = await prepareDatabase(config, env, [], ['--if-empty'])
  if (prepared !== 0) return prepared
  const built = await runStep('build client', config, bin(config, 'vite'), ['build'], {
    ...env,
    NODE_ENV: 'production',
  })
  if (built !== 0) return built
  console.log('\n==> server')
  return supervise([
    {
      name: 'server',
      cmd: bin(config, 'tsx'),
      args: ['server/main/index.ts'],
      cwd: config.repoRoot,
      env: {
        ...env,
        NODE_ENV: 'production',
        PORT: process.env.PORT || '4870',
        HOST: process.env.HOST || '127.0.0.1',
      },
    },
  ])
}

main(process.argv.slice(2)).then(
  (code) => process.exit(code),
  (err: unknown) => {
    console.error(err instanceof ServiceError ? `start: ${err.message}` : err)
    process.exit(1)
  },
)
