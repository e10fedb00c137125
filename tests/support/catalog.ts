import type pg from 'pg'

/** Anything that runs a query: the pool, or one client inside a transaction. */
export type Queryable = Pick<pg.PoolClient, 'query'>

export interface CatalogTable {
  name: string
  /** Column name by attribute number, as pg_constraint and pg_index refer to columns. */
  columns: Map<number, { name: string; notNull: boolean }>
}

export interface CatalogConstraint {
  name: string
  kind: 'primary' | 'foreign'
  table: string
  /** Attribute numbers of the constrained columns, in key order. */
  columns: number[]
  /** Foreign keys: the referenced table and its columns, in the same order. */
  refTable: string | null
  refColumns: number[]
}

export interface CatalogUniqueIndex {
  name: string
  table: string
  /** Attribute numbers in key order; 0 for an expression. */
  columns: number[]
  primary: boolean
}

/** The live catalog of the `public` schema: tables, keys and unique indexes. */
export async function readCatalog(db: Queryable) {
  const columns = await db.query<{
    table: string
    attnum: number
    name: string
    notnull: boolean
  }>(`
    select c.relname as table, a.attnum, a.attname as name, a.attnotnull as notnull
    from pg_class c
    join pg_namespace n on n.oid = c.relnamespace
    join pg_attribute a on a.attrelid = c.oid and a.attnum > 0 and not a.attisdropped
    where n.nspname = 'public' and c.relkind in ('r', 'p')
    order by c.relname, a.attnum`)
  const tables = new Map<string, CatalogTable>()
  for (const row of columns.rows) {
    const table = tables.get(row.table) ?? { name: row.table, columns: new Map() }
    table.columns.set(row.attnum, { name: row.name, notNull: row.notnull })
    tables.set(row.table, table)
  }
  const constraints = await db.query<{
    name: string
    contype: 'p' | 'f'
    table: string
    conkey: number[]
    reftable: string | null
    confkey: number[] | null
  }>(`
    select con.conname as name, con.contype, cl.relname as table, con.conkey,
      ref.relname as reftable, con.confkey
    from pg_constraint con
    join pg_class cl on cl.oid = con.conrelid
    join pg_namespace n on n.oid = cl.relnamespace
    left join pg_class ref on ref.oid = con.confrelid
    where n.nspname = 'public' and con.contype in ('p', 'f')
    order by cl.relname, con.conname`)
  const indexes = await db.query<{
    name: string
    table: string
    keys: number[]
    primary: boolean
  }>(`
    select i.relname as name, t.relname as table, x.indkey::int2[] as keys,
      x.indisprimary as primary
    from pg_index x
    join pg_class i on i.oid = x.indexrelid
    join pg_class t on t.oid = x.indrelid
    join pg_namespace n on n.oid = t.relnamespace
    where n.nspname = 'public' and x.indisunique
    order by t.relname, i.relname`)
  return {
    tables,
    constraints: constraints.rows.map((r): CatalogConstraint => ({
      name: r.name,
      kind: r.contype === 'p' ? 'primary' : 'foreign',
      table: r.table,
      columns: r.conkey,
      refTable: r.reftable,
      refColumns: r.confkey ?? [],
    })),
    uniqueIndexes: indexes.rows.map((r): CatalogUniqueIndex => ({
      name: r.name,
      table: r.table,
      columns: r.keys,
      primary: r.primary,
    })),
  }
}

export type Catalog = Awaited<ReturnType<typeof readCatalog>>

/** The attribute number of a column, or undefined. */
export function columnNumber(table: CatalogTable | undefined, name: string) {
  for (const [attnum, column] of table?.columns ?? []) if (column.name === name) return attnum
  return undefined
}

/** Every table of the `public` schema with a club_id column, by name. */
export async function tablesWithClubId(db: Queryable) {
  const { tables } = await readCatalog(db)
  return [...tables.values()]
    .filter((t) => columnNumber(t, 'club_id') !== undefined)
    .map((t) => t.name)
    .sort()
}
