// Runs a TypeScript entry through the project's own tsx, passing signals and exit codes on.
import { spawn } from 'node:child_process'
import path from 'node:path'

export function runTsx(entry, args = [], env = process.env) {
  const root = path.resolve(import.meta.dirname, '..')
  const tsx = path.join(root, 'node_modules', '.bin', 'tsx')
  const child = spawn(tsx, [path.join(root, entry), ...args], { cwd: root, stdio: 'inherit', env })
  for (const sig of ['SIGINT', 'SIGTERM']) process.on(sig, () => child.kill(sig))
  child.on('exit', (code, signal) => process.exit(code ?? (signal ? 1 : 0)))
}
