import { openDB, type DBSchema, type IDBPDatabase } from 'idb'
import type { ProgressEventInput, RecordView } from '@shared/schemas/progress'
import { outboxDbName } from './caches'

/** An entry made on the tablet, kept until the server has it. */
export interface OutboxEntry {
  /** Made on the tablet; the server stores an entry with the same id once. */
  clientEventId: string
  /** Order of making: entries are sent in it. */
  seq: number
  clubId: string
  /**
   * The user who made it: only they send it, so that a tablet shared by two coaches never sends
   * one's entries under the other's name. Absent on entries kept before it was recorded.
   */
  madeBy?: string | null
  athleteId: string
  athleteName: string
  elementName: string
  input: ProgressEventInput & { clientEventId: string }
  /** What the record is expected to be once the entry is stored, shown meanwhile. */
  predicted: RecordView
  madeAt: string
  status: 'waiting' | 'refused'
  /** Why the server refused it, in its words. */
  refusal: string | null
  /** For a conflict: the record as it stood when the entry was refused. */
  current: RecordView | null
}

interface OutboxSchema extends DBSchema {
  entries: { key: string; value: OutboxEntry; indexes: { seq: number } }
}

let opened: Promise<IDBPDatabase<OutboxSchema>> | null = null

function db() {
  opened ??= openDB<OutboxSchema>(outboxDbName, 1, {
    upgrade(database) {
      database.createObjectStore('entries', { keyPath: 'clientEventId' }).createIndex('seq', 'seq')
    },
    // Sign-out deletes the database: let go of it so that the deletion is not blocked.
    blocking() {
      void opened?.then((d) => d.close())
      opened = null
    },
  })
  return opened
}

/** Every kept entry, in the order made. */
export async function listEntries(): Promise<OutboxEntry[]> {
  return (await db()).getAllFromIndex('entries', 'seq')
}

export async function putEntry(entry: OutboxEntry) {
  await (await db()).put('entries', entry)
}

/**
 * Forgets a stored entry. A waiting entry that expected it as the record's newest event is
 * rewritten to expect the event the server made of it.
 */
export async function settleEntry(clientEventId: string, eventId: string | null) {
  const tx = (await db()).transaction('entries', 'readwrite')
  const all = await tx.store.getAll()
  for (const entry of all) {
    if (eventId && entry.input.expectedLastEventId === clientEventId) {
      entry.input = { ...entry.input, expectedLastEventId: eventId }
      await tx.store.put(entry)
    }
  }
  await tx.store.delete(clientEventId)
  await tx.done
}

/** Closes the connection so that the database can be deleted. */
export async function closeOutbox() {
  const current = opened
  opened = null
  if (current) (await current).close()
}
