import mysql from 'mysql2/promise'
import { drizzle } from 'drizzle-orm/mysql2'
import * as schema from './schema'

/**
 * One mysql2 pool and its Drizzle instance. `timezone: 'Z'` keeps DATETIME values in UTC
 * both ways. The app gets its instance from `useDB()`; tests make their own from a URL.
 */
export function createDB(url: string, { connectionLimit = 10 }: { connectionLimit?: number } = {}) {
  if (!url) throw new Error('No database URL: set NUXT_DATABASE_URL')
  const pool = mysql.createPool({
    uri: url,
    timezone: 'Z',
    connectionLimit,
    connectTimeout: 5_000,
    enableKeepAlive: true,
  })
  return drizzle(pool, { schema, mode: 'default' })
}

export type Database = ReturnType<typeof createDB>
