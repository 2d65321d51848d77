import { customType } from 'drizzle-orm/mysql-core'

/**
 * A JSON column that reads back as the value it was given. MariaDB stores JSON as
 * LONGTEXT with a json_valid CHECK, so the driver hands back a string; MySQL hands back
 * parsed JSON. This type accepts both.
 */
export const jsonDocument = <TData>(name: string) =>
  customType<{ data: TData, driverData: string }>({
    dataType: () => 'json',
    toDriver: value => JSON.stringify(value),
    fromDriver: (value) => {
      if (typeof value === 'string') return JSON.parse(value) as TData
      return value as TData
    },
  })(name)
