import express from 'express'
import request from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Database } from '../../server/db/client.ts'
import { errorHandler } from '../../server/http/errors.ts'
import { createUser } from '../../server/services/members.ts'
import { apiErrorBodySchema } from '../../shared/schemas/errors.ts'
import { freshDatabase } from '../support/database.ts'
import { testApp, type TestApp } from '../support/app.ts'

let database: Database
let t: TestApp
beforeAll(async () => {
  database = await freshDatabase()
  t = await testApp(database)
})
afterAll(async () => {
  await t.close()
  await database.close()
})

describe('API errors', () => {
  it('answers an unknown /api path with a JSON 404 in the error shape', async () => {
    const res = await request(t.app).get('/api/no-such-thing')
    expect(res.status).toBe(404)
    expect(res.headers['content-type']).toMatch(/application\/json/)
    expect(apiErrorBodySchema.parse(res.body).error.code).toBe('not_found')
  })

  it('answers a malformed JSON body with 400 in the error shape, not 500', async () => {
    const res = await request(t.app)
      .post('/api/health')
      .set('Content-Type', 'application/json')
      .send('{"name": "unfinished')
    expect(res.status).toBe(400)
    expect(res.body).toEqual({
      error: { code: 'malformed_json', message: 'The request body is not valid JSON.' },
    })
  })

  it('sends the security headers, with a CSP that allows only its own origin for scripts', async () => {
    const res = await request(t.app).get('/api/health')
    const csp = String(res.headers['content-security-policy'])
    expect(csp).toContain("script-src 'self'")
    expect(csp).not.toMatch(/script-src[^;]*unsafe-inline/)
    expect(res.headers['x-content-type-options']).toBe('nosniff')
  })
})

describe('a change that raced another', () => {
  it('answers 409 when two requests create the same thing at once, not 500', async () => {
    // Two new accounts with one e-mail address, as two invitations accepted at the same moment
    // would make: the second meets the unique index on users.
    const app = express()
    app.post('/race', async () => {
      await createUser(database.db, { email: 'race@test.example', name: 'First' })
      await createUser(database.db, { email: 'race@test.example', name: 'Second' })
    })
    app.use(errorHandler)
    const res = await request(app).post('/race')
    expect(res.status).toBe(409)
    expect(apiErrorBodySchema.parse(res.body).error.code).toBe('conflict')
  })
})
