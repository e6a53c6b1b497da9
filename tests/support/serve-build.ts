/**
 * Only the web server over the production build, on PORT, with the environment as given:
 * no migrations and no start-up checks of the database, so a test can run it against a
 * database that is down (tests/integration/http-server.test.ts).
 */
import '#scripts/mode-production.ts'
import { startServer } from '#scripts/server.ts'

const server = await startServer({ port: Number(process.env.PORT), mode: 'production' })
console.log(`listening on ${server.url}`)
const stop = async () => {
  await server.close()
  process.exit(0)
}
process.on('SIGINT', stop)
process.on('SIGTERM', stop)
