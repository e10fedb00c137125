import { and, eq } from 'drizzle-orm'
import { z } from 'zod'
import { disciplines } from '../../shared/domain/club.ts'
import {
  ageThresholdInputSchema,
  auditRunSchema,
  requirementProfileSchema,
  type AuditReport,
} from '../../shared/schemas/audits.ts'
import { publicOrigin, type AppContext } from '../context.ts'
import { enqueueMail } from '../mail/outbox.ts'
import { getAuditRun, submitAuditRun } from '../services/audit-runs.ts'
import { clubs, memberships, users } from '../db/schema-accounts.ts'
import { AppError } from '../http/errors.ts'
import { sendCsv } from '../http/responses.ts'
import { exportFileName, gapsCsv, headlineCsv } from '../services/audit-exports.ts'
import { clubAgeThresholds, clubProfiles } from '../services/audit-inputs.ts'
import {
  createProfile,
  deleteProfile,
  saveAgeThresholds,
  saveProfile,
} from '../services/audit-profiles.ts'
import { boardSummary, getReport, listAudits, publish, recheck } from '../services/audits.ts'
import type { ClubRoute } from './club-routes.ts'

const idParams = z.object({ id: z.uuid('No such audit.') })
const jobParams = z.object({ jobId: z.uuid('No such audit run.') })
const readers = ['director', 'coach', 'clinician'] as const
// A malformed id names no profile: it gets the 404 of any unknown one, not a 400.
const profileId = (raw: unknown) => {
  const id = requirementProfileSchema.shape.id.safeParse(raw)
  if (!id.success) throw new AppError(404, 'not_found', 'No such requirement profile in this club.')
  return id.data
}

/** Audits, their exports and settings, and the board's summary. */
export function auditRoutes(ctx: AppContext): ClubRoute[] {
  const clubName = async (clubId: string) =>
    (await ctx.db.select({ name: clubs.name }).from(clubs).where(eq(clubs.id, clubId)))[0]!.name
  // A squad audit is named after its squad, a club audit after the club.
  const csvName = async (clubId: string, kind: string, report: AuditReport) =>
    exportFileName(
      kind,
      report.audit.squadId ? report.audit.scopeName : await clubName(clubId),
      report.audit.asOf,
      'csv',
    )
  return [
    {
      method: 'get',
      path: '/audits',
      allow: readers,
      handler: async (req, res) => res.json(await listAudits(ctx.db, req.club.clubId)),
    },
    {
      method: 'post',
      path: '/audits',
      allow: ['director'],
      handler: async (req, res) => {
        const run = auditRunSchema.parse(req.body)
        res.status(202).json(await submitAuditRun(ctx.db, ctx.jobs, req.club, run))
      },
    },
    {
      method: 'get',
      path: '/audit-jobs/:jobId',
      allow: ['director'],
      handler: async (req, res) => {
        const { jobId } = jobParams.parse(req.params)
        res.json(await getAuditRun(ctx.db, ctx.jobs, req.club.clubId, jobId))
      },
    },
    {
      method: 'get',
      path: '/audits/:id',
      allow: readers,
      handler: async (req, res) =>
        res.json(await getReport(ctx.db, req.club, idParams.parse(req.params).id)),
    },
    {
      method: 'post',
      path: '/audits/:id/recheck',
      allow: ['director'],
      handler: async (req, res) =>
        res.json(await recheck(ctx.db, req.club, idParams.parse(req.params).id)),
    },
    {
      method: 'post',
      path: '/audits/:id/publish',
      allow: ['director'],
      handler: async (req, res) => {
        const { id } = idParams.parse(req.params)
        const name = await clubName(req.club.clubId)
        // Publishing and the board's notices commit together: no notice without the audit
        // published, no published audit without its notices on their way. Asked again (a retry,
        // a second tab), it answers the audit as published and tells nobody a second time.
        const outcome = await ctx.db.transaction(async (tx) => {
          const { row, newly } = await publish(tx, req.club, id)
          if (!newly) return { notified: 0, alreadyPublished: true }
          const board = await tx
            .select({ email: users.email, name: users.name })
            .from(memberships)
            .innerJoin(users, eq(users.id, memberships.userId))
            .where(and(eq(memberships.clubId, req.club.clubId), eq(memberships.role, 'board')))
          for (const member of board) {
            await enqueueMail(tx, ctx.jobs, {
              to: member.email,
              subject: `${name}: the audit as of ${row.asOf} is ready`,
              text: [
                `Hello ${member.name},`,
                '',
                `The technical director has published the forward/backward audit of ${name} as of ${row.asOf}.`,
                'The summary chart and the headline figures are on the board page:',
                '',
                `${publicOrigin(ctx.env)}/board`,
              ].join('\n'),
            })
          }
          return { notified: board.length, alreadyPublished: false }
        })
        res.json({ ...(await getReport(ctx.db, req.club, id)).audit, ...outcome })
      },
    },
    {
      method: 'get',
      path: '/audits/:id/gaps.csv',
      allow: readers,
      handler: async (req, res) => {
        const report = await getReport(ctx.db, req.club, idParams.parse(req.params).id)
        sendCsv(res, await csvName(req.club.clubId, 'gaps', report), gapsCsv(report))
      },
    },
    {
      method: 'get',
      path: '/audits/:id/headline.csv',
      allow: readers,
      handler: async (req, res) => {
        const report = await getReport(ctx.db, req.club, idParams.parse(req.params).id)
        sendCsv(res, await csvName(req.club.clubId, 'headline', report), headlineCsv(report))
      },
    },
    {
      method: 'get',
      path: '/requirement-profiles',
      allow: readers,
      handler: async (req, res) => res.json(await clubProfiles(ctx.db, req.club.clubId)),
    },
    {
      method: 'post',
      path: '/requirement-profiles',
      allow: ['director'],
      handler: async (req, res) =>
        res
          .status(201)
          .json(await createProfile(ctx.db, req.club, requirementProfileSchema.parse(req.body))),
    },
    {
      method: 'put',
      path: '/requirement-profiles/:id',
      allow: ['director'],
      handler: async (req, res) => {
        const input = requirementProfileSchema.parse({ ...req.body, id: req.params.id })
        res.json(await saveProfile(ctx.db, req.club, input))
      },
    },
    {
      method: 'delete',
      path: '/requirement-profiles/:id',
      allow: ['director'],
      handler: async (req, res) => {
        await deleteProfile(ctx.db, req.club, profileId(req.params.id))
        res.status(204).end()
      },
    },
    {
      method: 'get',
      path: '/age-thresholds',
      allow: readers,
      handler: async (req, res) => res.json(await clubAgeThresholds(ctx.db, req.club.clubId)),
    },
    {
      method: 'put',
      path: '/age-thresholds/:discipline',
      allow: ['director'],
      handler: async (req, res) => {
        const discipline = z.enum(disciplines).safeParse(req.params.discipline)
        if (!discipline.success) throw new AppError(404, 'not_found', 'No such discipline.')
        res.json(
          await saveAgeThresholds(
            ctx.db,
            req.club,
            discipline.data,
            ageThresholdInputSchema.parse(req.body),
          ),
        )
      },
    },
    {
      method: 'get',
      path: '/board-summary',
      allow: ['director', 'board'],
      handler: async (req, res) => res.json(await boardSummary(ctx.db, req.club.clubId)),
    },
  ]
}
