/** `npm run db:start | db:stop | db:status` for the private PostgreSQL cluster. */
import { ClusterError, clusterStatus, startCluster, stopCluster } from './postgres.ts'

const command = process.argv[2]
try {
  if (command === 'start') {
    const c = await startCluster()
    console.log(`DATABASE_URL=${c.url}`)
  } else if (command === 'stop') {
    stopCluster()
  } else if (command === 'status') {
    console.log(clusterStatus())
  } else {
    console.error('Usage: tsx scripts/db.ts start|stop|status')
    process.exit(2)
  }
} catch (e) {
  console.error(e instanceof ClusterError ? e.message : e)
  process.exit(1)
}
