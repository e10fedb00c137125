import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Database } from '../../server/db/client.ts'
import { columnNumber, readCatalog, type Catalog, type Queryable } from '../support/catalog.ts'
import { freshDatabase } from '../support/database.ts'

// The club tables are to be distributed by club_id (README, "Beyond one database"). This reads
// the catalog of a migrated database and holds the schema to what that needs, so that a table
// or key added later cannot quietly break it. Only the `public` schema is read: other schemas
// (the job queue's, the migrator's) hold no club data.

/**
 * Tables that are not distributed by club: each is read by a value that does not name a club
 * (an id, an e-mail, a token, a limiter key), and would be a reference table. A table without
 * club_id must be listed here.
 */
const referenceTables: Record<string, string> = {
  clubs: 'the clubs themselves; every club table refers to them',
  users: 'a person may belong to several clubs; looked up by e-mail at sign-in',
  sessions: 'looked up by the cookie; club_id is only a pointer to the club last worked in',
  password_resets: 'looked up by the token in the link, per person',
  rate_limits: 'limiter counters by client and account',
  invitation_tokens: 'looked up by the token in the link, before the club is known',
  club_signups: 'looked up by the token in the link of a club not yet created',
  mail_outbox: 'mail on its way to a person, sent by any worker whatever the club',
  __drizzle_migrations: "the migrator's own record, should it live in public",
}

/** Unique indexes of club tables that may leave club_id out, with the reason. None today. */
const uniqueWithoutClubId: Record<string, string> = {}

/**
 * Columns of club tables named like a reference to a row (`*_id`) that no foreign key checks,
 * with the reason.
 */
const idsWithoutForeignKey: Record<string, string> = {
  'audit_runs.job_id': "a job of the queue, in pg-boss's own schema",
  'club_archives.job_id': "a job of the queue, in pg-boss's own schema",
  'report_pdfs.job_id': "a job of the queue, in pg-boss's own schema",
  'progress_events.client_event_id': 'the id a tablet made for an entry, before any row existed',
}

/**
 * Foreign keys from a reference table into club data, with the reason. A distributed database
 * cannot keep these, so each must be one the services never rely on.
 */
const referenceToClubKeys: Record<string, string> = {
  'invitation_tokens → invitations':
    'integrity on one database; the services delete the link with its invitation themselves',
}

/** What in the catalog would stop the club tables from being distributed by club_id. */
function distributionProblems(
  { tables, constraints, uniqueIndexes }: Catalog,
  references: Record<string, string> = referenceTables,
) {
  const problems: string[] = []
  const clubTables = new Set<string>()
  for (const table of tables.values()) {
    if (table.name in references) continue
    const clubId = columnNumber(table, 'club_id')
    if (clubId === undefined) {
      problems.push(`${table.name}: no club_id and not a listed reference table`)
      continue
    }
    clubTables.add(table.name)
    if (!table.columns.get(clubId)!.notNull) problems.push(`${table.name}: club_id may be null`)
    const primary = constraints.find((c) => c.table === table.name && c.kind === 'primary')
    if (!primary) problems.push(`${table.name}: no primary key`)
    else if (primary.columns[0] !== clubId)
      problems.push(`${table.name}: primary key ${primary.name} does not lead with club_id`)
  }
  const clubIdOf = (name: string) => columnNumber(tables.get(name), 'club_id')
  const foreignKeys = constraints.filter((c) => c.kind === 'foreign')
  for (const name of clubTables) {
    for (const [attnum, column] of tables.get(name)!.columns) {
      if (!column.name.endsWith('_id') || column.name === 'club_id') continue
      if (foreignKeys.some((fk) => fk.table === name && fk.columns.includes(attnum))) continue
      if (`${name}.${column.name}` in idsWithoutForeignKey) continue
      problems.push(`${name}: ${column.name} names a row but no foreign key checks it`)
    }
  }
  for (const fk of foreignKeys) {
    const target = fk.refTable!
    if (clubTables.has(fk.table) && clubTables.has(target)) {
      if (fk.columns[0] !== clubIdOf(fk.table) || fk.refColumns[0] !== clubIdOf(target))
        problems.push(`${fk.table}: foreign key ${fk.name} to ${target} does not lead with club_id`)
    } else if (!clubTables.has(fk.table) && clubTables.has(target)) {
      if (!(`${fk.table} → ${target}` in referenceToClubKeys))
        problems.push(`${fk.table}: foreign key ${fk.name} from a reference table to ${target}`)
    }
  }
  for (const index of uniqueIndexes) {
    if (!clubTables.has(index.table) || index.primary || index.name in uniqueWithoutClubId) continue
    if (!index.columns.includes(clubIdOf(index.table)!))
      problems.push(`${index.table}: unique index ${index.name} does not include club_id`)
  }
  return { problems, clubTables }
}

let database: Database

beforeAll(async () => {
  database = await freshDatabase()
})
afterAll(async () => {
  await database.close()
})

describe('the schema, ready to be distributed by club_id', () => {
  it('keys every club table, its foreign keys and unique indexes by club_id', async () => {
    const { problems, clubTables } = distributionProblems(await readCatalog(database.pool))
    // The catalog was read: the club tables are there.
    expect([...clubTables]).toEqual(
      expect.arrayContaining(['athletes', 'progress_events', 'invitations', 'audits']),
    )
    expect(problems).toEqual([])
  })

  it('finds each kind of problem in tables made to have them', async () => {
    const client = await database.pool.connect()
    try {
      await client.query('begin')
      await client.query(`
        create table scratch_global (id uuid primary key, name text);
        create table scratch_club (
          id uuid primary key, club_id uuid, code text unique, athlete_id uuid
        );
        create table scratch_child (
          club_id uuid not null, id uuid not null, parent_id uuid,
          primary key (club_id, id),
          foreign key (parent_id, club_id) references athletes (id, club_id)
        );
        create table scratch_pointer (
          token text primary key references sessions (id), club_id uuid, athlete_id uuid,
          foreign key (club_id, athlete_id) references athletes (club_id, id)
        );`)
      const { problems: all } = distributionProblems(await readCatalog(client as Queryable), {
        ...referenceTables,
        scratch_pointer: 'stands for a listed reference table',
      })
      const problems = all.filter((p) => p.startsWith('scratch_'))
      expect(problems).toEqual(
        expect.arrayContaining([
          'scratch_global: no club_id and not a listed reference table',
          'scratch_club: club_id may be null',
          'scratch_club: primary key scratch_club_pkey does not lead with club_id',
          'scratch_club: unique index scratch_club_code_key does not include club_id',
          'scratch_club: athlete_id names a row but no foreign key checks it',
          expect.stringMatching(/^scratch_child: foreign key .* to athletes does not lead with/),
          expect.stringMatching(/^scratch_pointer: foreign key .* from a reference table/),
        ]),
      )
      expect(problems).toHaveLength(7)
    } finally {
      await client.query('rollback')
      client.release()
    }
  })
})
