import { describe, expect, it } from 'vitest'
import { athleteInputSchema } from '../../shared/schemas/athletes.ts'

const valid = {
  givenName: 'Ada',
  familyName: 'Ashcombe',
  birthYear: 2014,
  squadId: '6f1c1c1e-8a53-4c1b-9f3e-0a3a4f1f7b21',
  discipline: 'artistic-women',
} as const

describe('athlete input', () => {
  it('accepts a complete athlete with only the birth year', () => {
    expect(athleteInputSchema.parse(valid)).toEqual(valid)
  })

  it.each([
    [
      'birthYear',
      { birthYear: new Date().getFullYear() + 1 },
      'The birth year cannot be in the future.',
    ],
    ['birthYear', { birthYear: 1800 }, 'The birth year must be 1930 or later.'],
    ['givenName', { givenName: '  ' }, 'Enter the given name.'],
    ['squadId', { squadId: 'not-a-squad' }, 'Choose a squad.'],
  ])('names the field %s in its message', (field, change, message) => {
    const result = athleteInputSchema.safeParse({ ...valid, ...change })
    expect(result.success).toBe(false)
    const issue = result.error?.issues[0]
    expect(issue?.path).toEqual([field])
    expect(issue?.message).toBe(message)
  })
})
