import { existsSync, mkdirSync, writeFileSync } from 'node:fs'
import { findPgBin } from './serviceConfig'
import { capture, ServiceError, which } from './proc'

let isAptUpdated = false

/** Debian packages each local service needs, with the check that says it is present. */
const PACKAGES: Record<string, () => boolean> = {
  postgresql: () => findPgBin() !== null,
  'redis-server': () => which('redis-server') !== null && which('redis-cli') !== null,
  chromium: () => existsSync('/usr/bin/chromium'),
}

export type DebianPackage = keyof typeof PACKAGES

/** Lists which of `names` are not installed yet. */
export function missingPackages(names: readonly DebianPackage[]): DebianPackage[] {
  return names.filter((name) => !PACKAGES[name]())
}

// Debian's postgresql package creates and starts a default cluster on 5432 unless told not
// to; a drop-in in createcluster.d does that without editing the packaged conffile.
function preventDefaultCluster(): void {
  const dir = '/etc/postgresql-common/createcluster.d'
  mkdirSync(dir, { recursive: true })
  writeFileSync(`${dir}/waymark-no-main-cluster.conf`, 'create_main_cluster = false\n')
}

async function apt(args: string[]): Promise<void> {
  const env = { ...process.env, DEBIAN_FRONTEND: 'noninteractive' }
  const result = await capture('apt-get', args, { env })
  if (result.code !== 0) {
    const tail = `${result.stdout}\n${result.stderr}`.trim().split('\n').slice(-10).join('\n')
    throw new ServiceError(`apt-get ${args.join(' ')} failed (exit ${result.code}):\n${tail}`)
  }
}

/**
 * Installs the missing ones of `names` with apt-get when running as root; otherwise throws
 * a ServiceError that names the packages to install.
 */
export async function ensurePackages(
  names: readonly DebianPackage[],
  log = console.log,
): Promise<void> {
  const missing = missingPackages(names)
  if (missing.length === 0) return
  const isRoot = typeof process.getuid === 'function' && process.getuid() === 0
  if (!isRoot) {
    throw new ServiceError(
      `missing Debian packages: ${missing.join(' ')}\n` +
        `install them first: sudo apt-get install -y --no-install-recommends ${missing.join(' ')}`,
    )
  }
  if (missing.includes('postgresql')) preventDefaultCluster()
  log(`packages: installing ${missing.join(' ')} (apt-get)`)
  if (!isAptUpdated) {
    await apt(['update'])
    isAptUpdated = true
  }
  await apt([
    'install',
    '-y',
    '--no-install-recommends',
    '-o',
    'Dpkg::Options::=--force-confold',
    ...missing,
  ])
  const still = missingPackages(missing)
  if (still.length > 0)
    throw new ServiceError(`packages still missing after apt-get: ${still.join(' ')}`)
  log(`packages: installed ${missing.join(' ')}`)
}
