import { version } from '~~/package.json'

// Long enough for a busy database, short enough that a probe never hangs.
const DB_ANSWER_MS = 2_000

function probe(): Promise<boolean> {
  return useDB().$client
    .query({ sql: 'SELECT 1 AS ok', timeout: DB_ANSWER_MS })
    .then(() => true, () => false)
}

async function databaseAnswers(): Promise<boolean> {
  let timer: ReturnType<typeof setTimeout> | undefined
  const timeout = new Promise<false>((resolve) => {
    timer = setTimeout(() => resolve(false), DB_ANSWER_MS)
  })
  // A second try, because the pool may hand out a connection the database closed
  // when it restarted; the failed one is dropped from the pool.
  const answered = probe().then(ok => ok || probe())
  try {
    return await Promise.race([answered, timeout])
  }
  finally {
    clearTimeout(timer)
  }
}

export default defineEventHandler(async (event) => {
  setHeader(event, 'cache-control', 'no-store')
  if (await databaseAnswers()) {
    return { ok: true, db: 'ok', version }
  }
  setResponseStatus(event, 503, 'Database unavailable')
  return { ok: false, db: 'down', version }
})
