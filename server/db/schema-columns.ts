import { timestamp } from 'drizzle-orm/pg-core'

/** When a row was made: set by the database, with its time zone. */
export const createdAt = () =>
  timestamp({ withTimezone: true, mode: 'date' }).notNull().defaultNow()
