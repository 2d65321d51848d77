// Typed access to the launcher the run uses, for tests that start a server of their own.
import { fileURLToPath } from 'node:url'
export { startServer } from '../../scripts/setup.mjs'
export const resultsDir = fileURLToPath(new URL('../../test-results/', import.meta.url))
