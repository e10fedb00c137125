import { describe, expect, it } from 'vitest'
import { EnvError, parseEnv } from '../../server/env.ts'

describe('environment parsing', () => {
  it('fills in the defaults', () => {
    const env = parseEnv({})
    expect(env.PORT).toBe(3000)
    expect(env.HOST).toBe('127.0.0.1')
    expect(env.SESSION_IDLE_MINUTES).toBe(60)
    expect(env.SESSION_ABSOLUTE_HOURS).toBe(12)
  })

  it.each([
    ['PORT', 'eighty'],
    ['PORT', '70000'],
    ['DATABASE_URL', 'mysql://localhost/db'],
    ['LOG_LEVEL', 'loud'],
  ])('refuses %s=%s with a message naming the variable', (name, value) => {
    expect(() => parseEnv({ [name]: value })).toThrow(EnvError)
    expect(() => parseEnv({ [name]: value })).toThrow(new RegExp(`${name}:`))
  })
})
