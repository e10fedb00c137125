import request from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { createDatabase } from '../../server/db/client.ts'
import {
  clusterUrl,
  removeCluster,
  startCluster,
  stopCluster,
  throwawayCluster,
} from '../../server/cli/postgres.ts'
import { freshDatabase } from '../support/database.ts'
import { testApp } from '../support/app.ts'

describe('GET /api/health', () => {
  it('answers ok with the database up', async () => {
    const database = await freshDatabase()
    const t = await testApp(database)
    try {
      const res = await request(t.app).get('/api/health')
      expect(res.status).toBe(200)
      expect(res.body).toEqual({ status: 'ok', database: 'up' })
    } finally {
      await t.close()
      await database.close()
    }
  })

  describe('while PostgreSQL restarts', () => {
    // A cluster of this test's own, so that stopping it cannot disturb the other test files.
    let cluster: Awaited<ReturnType<typeof throwawayCluster>>
    beforeAll(async () => {
      cluster = await throwawayCluster('twofold-health-')
      startCluster(cluster)
    })
    afterAll(() => removeCluster(cluster))

    it('answers 503 with the database down, and ok again once it is back', async () => {
      const database = createDatabase(clusterUrl(cluster, 'postgres'))
      // An empty database: no tables, no job queues to work on.
      const t = await testApp(database, { worker: false })
      const app = t.app
      try {
        expect((await request(app).get('/api/health')).body.database).toBe('up')

        stopCluster(cluster)
        const down = await request(app).get('/api/health')
        expect(down.status).toBe(503)
        expect(down.body).toEqual({ status: 'degraded', database: 'down' })

        startCluster(cluster)
        const up = await request(app).get('/api/health')
        expect(up.status).toBe(200)
        expect(up.body).toEqual({ status: 'ok', database: 'up' })
      } finally {
        await t.close()
        await database.close()
      }
    })
  })
})
