import { randomUUID } from 'node:crypto'
import type { Role } from '../../shared/domain/club.ts'
import { hashPassword } from '../auth/password.ts'
import type { DbOrTx } from '../db/client.ts'
import { memberships, users } from '../db/schema.ts'

export interface NewUser {
  email: string
  name: string
  /** Omitted for a person who has not set one yet. */
  password?: string
}

export async function createUser(db: DbOrTx, input: NewUser) {
  const passwordHash = input.password ? await hashPassword(input.password) : null
  const [user] = await db
    .insert(users)
    .values({
      id: randomUUID(),
      email: input.email.trim().toLowerCase(),
      name: input.name.trim(),
      passwordHash,
    })
    .returning()
  return user!
}

export interface NewMembership {
  clubId: string
  userId: string
  role: Role
  accessStartsOn?: string | null
  accessEndsOn?: string | null
}

export async function addMembership(db: DbOrTx, input: NewMembership) {
  const [membership] = await db.insert(memberships).values(input).returning()
  return membership!
}
