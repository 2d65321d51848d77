import { createDB, type Database } from '../db/client'

export * as tables from '../db/schema'

let db: Database | undefined

/** The app's one Drizzle instance (and pool), made on first use from runtime config. */
export function useDB(): Database {
  db ??= createDB(useRuntimeConfig().databaseUrl)
  return db
}
