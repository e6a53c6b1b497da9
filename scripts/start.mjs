// `npm start`: everything from a fresh clone to the served demo.
import './bootstrap.mjs'
import { runTsx } from './run-tsx.mjs'

runTsx('scripts/start-app.ts', process.argv.slice(2))
