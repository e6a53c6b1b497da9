/**
 * The private PostgreSQL cluster that `npm start`, `npm run dev` and `npm test` start
 * themselves when DATABASE_URL is not set: Debian's server binaries, a cluster in a
 * git-ignored folder, listening on 127.0.0.1 only on a non-default port, with its socket
 * inside that folder. initdb and postgres refuse to run as root, so as root every server
 * command runs as the unprivileged `postgres` OS user.
 *
 * Plain Node (no app imports) so that it works before anything else is set up.
 */
import { spawnSync } from 'node:child_process'
import { randomBytes, createHash } from 'node:crypto'
import fs from 'node:fs'
import path from 'node:path'
import net from 'node:net'

export const projectRoot = path.resolve(import.meta.dirname, '..')

const DEFAULT_PORT = 54329
const SERVER_USER = 'postgres'

export type Cluster = {
  dir: string
  dataDir: string
  socketDir: string
  logFile: string
  port: number
  user: string
  password: string
  /** URL of the app's own database in the cluster. */
  url: string
  /** URL of the maintenance database, for CREATE/DROP DATABASE. */
  adminUrl: string
}

function isRoot() {
  return typeof process.getuid === 'function' && process.getuid() === 0
}

function findBinDir(): string | null {
  const candidates: string[] = []
  if (process.env.PG_BIN_DIR) candidates.push(process.env.PG_BIN_DIR)
  const base = '/usr/lib/postgresql'
  if (fs.existsSync(base)) {
    const versions = fs
      .readdirSync(base)
      .filter((v) => /^\d+$/.test(v))
      .sort((a, b) => Number(b) - Number(a))
    for (const v of versions) candidates.push(path.join(base, v, 'bin'))
  }
  return (
    candidates.find((dir) => fs.existsSync(path.join(dir, 'pg_ctl')) && fs.existsSync(path.join(dir, 'initdb'))) ?? null
  )
}

/** Finds Debian's server binaries, installing the `postgresql` package when run as root. */
export function ensureServerBinaries(log: (line: string) => void = console.log): string {
  let bin = findBinDir()
  if (bin) return bin
  if (!isRoot()) {
    throw new ClusterError(
      'PostgreSQL server binaries were not found (looked in /usr/lib/postgresql/*/bin).\n' +
        'Install them with:  sudo apt-get update && sudo apt-get install -y postgresql\n' +
        'or point DATABASE_URL at an existing PostgreSQL server.',
    )
  }
  log('PostgreSQL server binaries are missing: installing Debian\'s "postgresql" package (apt-get)…')
  run('apt-get', ['update', '-qq'], { stdio: 'inherit' })
  run('apt-get', ['install', '-y', '-qq', 'postgresql'], {
    stdio: 'inherit',
    env: { ...process.env, DEBIAN_FRONTEND: 'noninteractive' },
  })
  bin = findBinDir()
  if (!bin) throw new ClusterError('apt-get install postgresql finished but no server binaries were found.')
  return bin
}

export class ClusterError extends Error {}

function run(cmd: string, args: string[], opts: Parameters<typeof spawnSync>[2] = {}) {
  const r = spawnSync(cmd, args, { encoding: 'utf8', ...opts })
  if (r.error) throw new ClusterError(`${cmd} could not be run: ${r.error.message}`)
  if (r.status !== 0) {
    const out = `${r.stdout ?? ''}${r.stderr ?? ''}`.trim()
    throw new ClusterError(`${cmd} ${args.join(' ')} failed (exit ${r.status})${out ? `:\n${out}` : ''}`)
  }
  return String(r.stdout ?? '')
}

/** Runs a server binary, as the `postgres` OS user when we are root. */
function runServerTool(bin: string, tool: string, args: string[], opts: Parameters<typeof spawnSync>[2] = {}) {
  const exe = path.join(bin, tool)
  if (isRoot()) return run('runuser', ['-u', SERVER_USER, '--', exe, ...args], opts)
  return run(exe, args, opts)
}

function canServerUserUse(dir: string): boolean {
  if (!isRoot()) return true
  const r = spawnSync('runuser', ['-u', SERVER_USER, '--', 'test', '-x', dir], { stdio: 'ignore' })
  return r.status === 0
}

/**
 * Where the cluster lives: .data/postgres in the project, unless the `postgres` user
 * cannot reach the project folder (for example a checkout under /root), in which case a
 * folder under /var/tmp named after the project's path is used.
 */
export function clusterDir(): string {
  if (process.env.CYCLEWRIGHT_PG_DIR) return path.resolve(process.env.CYCLEWRIGHT_PG_DIR)
  const local = path.join(projectRoot, '.data', 'postgres')
  if (canServerUserUse(projectRoot)) return local
  const hash = createHash('sha256').update(projectRoot).digest('hex').slice(0, 12)
  return path.join('/var/tmp', `cyclewright-pg-${hash}`)
}

function chownToServerUser(p: string) {
  if (isRoot()) run('chown', ['-R', `${SERVER_USER}:${SERVER_USER}`, p])
}

function readOrCreate(file: string, make: () => string): string {
  if (fs.existsSync(file)) return fs.readFileSync(file, 'utf8').trim()
  const value = make()
  fs.writeFileSync(file, value + '\n', { mode: 0o600 })
  return value
}

function storedPort(dir: string): number {
  if (process.env.CYCLEWRIGHT_PG_PORT) return Number(process.env.CYCLEWRIGHT_PG_PORT)
  const file = path.join(dir, 'port')
  return fs.existsSync(file) ? Number(fs.readFileSync(file, 'utf8').trim()) || DEFAULT_PORT : DEFAULT_PORT
}

function describe(dir: string): Omit<Cluster, 'password' | 'url' | 'adminUrl'> {
  const port = storedPort(dir)
  return {
    dir,
    dataDir: path.join(dir, 'data'),
    socketDir: path.join(dir, 'run'),
    logFile: path.join(dir, 'server.log'),
    port,
    user: 'cyclewright',
  }
}

function urls(c: Omit<Cluster, 'url' | 'adminUrl'>) {
  const auth = `${c.user}:${encodeURIComponent(c.password)}`
  return {
    url: `postgres://${auth}@127.0.0.1:${c.port}/cyclewright`,
    adminUrl: `postgres://${auth}@127.0.0.1:${c.port}/postgres`,
  }
}

function isRunning(bin: string, c: ReturnType<typeof describe>): boolean {
  const exe = path.join(bin, 'pg_ctl')
  const args = ['status', '-D', c.dataDir]
  const r = isRoot()
    ? spawnSync('runuser', ['-u', SERVER_USER, '--', exe, ...args], { encoding: 'utf8' })
    : spawnSync(exe, args, { encoding: 'utf8' })
  return r.status === 0
}

function portIsFree(port: number): Promise<boolean> {
  return new Promise((resolve) => {
    const s = net.createServer()
    s.once('error', () => resolve(false))
    s.listen(port, '127.0.0.1', () => s.close(() => resolve(true)))
  })
}

/**
 * Creates the cluster on first use and starts it; a second call reuses it. Idempotent:
 * an already running server is left as it is, and a stale postmaster.pid left by a crash
 * is removed before starting.
 */
export async function startCluster(log: (line: string) => void = console.log): Promise<Cluster> {
  const bin = ensureServerBinaries(log)
  const dir = clusterDir()
  let c = describe(dir)
  fs.mkdirSync(path.dirname(dir), { recursive: true, mode: 0o755 })
  fs.mkdirSync(dir, { recursive: true, mode: 0o700 })
  const password = readOrCreate(path.join(dir, 'password'), () => randomBytes(18).toString('base64url'))

  if (!fs.existsSync(path.join(c.dataDir, 'PG_VERSION'))) {
    log(`Creating the private PostgreSQL cluster in ${path.relative(projectRoot, dir) || dir} …`)
    fs.rmSync(c.dataDir, { recursive: true, force: true })
    const pwfile = path.join(dir, 'initdb.pw')
    fs.writeFileSync(pwfile, password + '\n', { mode: 0o600 })
    fs.mkdirSync(c.socketDir, { recursive: true })
    chownToServerUser(dir)
    try {
      runServerTool(bin, 'initdb', [
        '-D',
        c.dataDir,
        '-U',
        c.user,
        '--pwfile',
        pwfile,
        '--auth-local=scram-sha-256',
        '--auth-host=scram-sha-256',
        '-E',
        'UTF8',
        '--locale=C.UTF-8',
      ])
    } finally {
      fs.rmSync(pwfile, { force: true })
    }
  }
  fs.mkdirSync(c.socketDir, { recursive: true })
  chownToServerUser(dir)
  // The password file stays readable by us only.
  if (isRoot()) run('chown', ['root:root', path.join(dir, 'password')])

  if (isRunning(bin, c)) {
    const running = { ...c, password, ...urls({ ...c, password }) }
    await ensureDatabase(running, 'cyclewright')
    return running
  }

  const pidFile = path.join(c.dataDir, 'postmaster.pid')
  if (fs.existsSync(pidFile)) {
    log('Removing a stale postmaster.pid left by an earlier crash.')
    fs.rmSync(pidFile, { force: true })
  }
  if (!(await portIsFree(c.port))) {
    // Another program (or another checkout's cluster) has the port: take the next free one
    // and remember it for this cluster, unless the port was set explicitly.
    let found: number | null = null
    if (!process.env.CYCLEWRIGHT_PG_PORT) {
      for (let p = DEFAULT_PORT + 1; p < DEFAULT_PORT + 50 && found === null; p++) if (await portIsFree(p)) found = p
    }
    if (found === null) {
      throw new ClusterError(
        `Port ${c.port} on 127.0.0.1 is taken by another program. Set CYCLEWRIGHT_PG_PORT to a free port, or DATABASE_URL to an existing server.`,
      )
    }
    log(`Port ${c.port} is taken; the private cluster uses ${found} instead.`)
    fs.writeFileSync(path.join(dir, 'port'), `${found}\n`)
    c = { ...c, port: found }
  }
  runServerTool(bin, 'pg_ctl', [
    'start',
    '-D',
    c.dataDir,
    '-l',
    c.logFile,
    '-w',
    '-t',
    '60',
    '-o',
    `-c listen_addresses=127.0.0.1 -p ${c.port} -k ${c.socketDir} -c max_connections=200 -c fsync=${process.env.CI ? 'off' : 'on'}`,
  ])
  log(`PostgreSQL is listening on 127.0.0.1:${c.port}.`)
  const full = { ...c, password, ...urls({ ...c, password }) }
  await ensureDatabase(full, 'cyclewright')
  return full
}

export function stopCluster(log: (line: string) => void = console.log) {
  const bin = findBinDir()
  const dir = clusterDir()
  const c = describe(dir)
  if (!bin || !fs.existsSync(path.join(c.dataDir, 'PG_VERSION'))) {
    log('No private PostgreSQL cluster to stop.')
    return
  }
  if (!isRunning(bin, c)) {
    log('The private PostgreSQL cluster is not running.')
    return
  }
  runServerTool(bin, 'pg_ctl', ['stop', '-D', c.dataDir, '-m', 'fast', '-w'])
  log('PostgreSQL stopped.')
}

export function clusterStatus(): string {
  const bin = findBinDir()
  const c = describe(clusterDir())
  if (!bin) return 'PostgreSQL server binaries are not installed.'
  if (!fs.existsSync(path.join(c.dataDir, 'PG_VERSION'))) return `No cluster yet (it will be created in ${c.dir}).`
  return isRunning(bin, c)
    ? `Running on 127.0.0.1:${c.port} (data in ${c.dataDir}).`
    : `Stopped (data in ${c.dataDir}).`
}

/** Creates a database in the cluster when it does not exist yet. */
export async function ensureDatabase(c: { adminUrl: string }, name: string, template?: string) {
  const { default: pg } = await import('pg')
  const client = new pg.Client({ connectionString: c.adminUrl })
  await client.connect()
  try {
    const r = await client.query('select 1 from pg_database where datname = $1', [name])
    if (r.rowCount === 0) {
      await client.query(`create database "${name}"${template ? ` template "${template}"` : ''}`)
    }
  } finally {
    await client.end()
  }
}

/** The database URL everything uses: DATABASE_URL when set, else the private cluster's. */
export async function resolveDatabaseUrl(log?: (line: string) => void): Promise<string> {
  if (process.env.DATABASE_URL) return process.env.DATABASE_URL
  const c = await startCluster(log)
  return c.url
}
