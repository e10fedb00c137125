import { z } from 'zod'
import {
  elementImportSchema,
  elementQuerySchema,
  prerequisitesUpdateSchema,
  stepsUpdateSchema,
  templateUpdateSchema,
} from '../../shared/schemas/catalogue.ts'
import type { AppContext } from '../context.ts'
import { sendCsv, sendImportResult } from '../http/responses.ts'
import { getElement, listElements } from '../services/catalogue.ts'
import { exportCsv, importElements } from '../services/catalogue-csv.ts'
import { replacePrerequisites, replaceSteps } from '../services/catalogue-steps.ts'
import { listTemplates, updateTemplate } from '../services/catalogue-templates.ts'
import { createElement, deleteElement, updateElement } from '../services/catalogue-writes.ts'
import type { ClubRoute } from './club-routes.ts'

const idParams = z.object({ id: z.uuid('No such element.') })
const familyParams = z.object({ family: z.string().min(1).max(60) })
const readers = ['director', 'coach', 'clinician'] as const

/** The catalogue: elements, their progressions and prerequisites, templates, CSV. */
export function catalogueRoutes(ctx: AppContext): ClubRoute[] {
  return [
    {
      method: 'get',
      path: '/elements',
      allow: readers,
      handler: async (req, res) =>
        res.json(await listElements(ctx.db, req.club.clubId, elementQuerySchema.parse(req.query))),
    },
    {
      method: 'post',
      path: '/elements',
      allow: ['director'],
      handler: async (req, res) =>
        res.status(201).json(await createElement(ctx.db, req.club, req.body)),
    },
    {
      method: 'get',
      path: '/elements/export',
      allow: readers,
      handler: async (req, res) => {
        sendCsv(res, 'catalogue.csv', await exportCsv(ctx.db, req.club.clubId))
      },
    },
    {
      method: 'post',
      path: '/elements/import',
      allow: ['director'],
      handler: async (req, res) => {
        const { rows, dryRun } = elementImportSchema.parse(req.body)
        const result = await importElements(ctx.db, req.club, rows, dryRun)
        sendImportResult(res, result, dryRun)
      },
    },
    {
      method: 'get',
      path: '/elements/:id',
      allow: readers,
      handler: async (req, res) =>
        res.json(await getElement(ctx.db, req.club.clubId, idParams.parse(req.params).id)),
    },
    {
      method: 'patch',
      path: '/elements/:id',
      allow: ['director'],
      handler: async (req, res) =>
        res.json(await updateElement(ctx.db, req.club, idParams.parse(req.params).id, req.body)),
    },
    {
      method: 'delete',
      path: '/elements/:id',
      allow: ['director'],
      handler: async (req, res) => {
        await deleteElement(ctx.db, req.club, idParams.parse(req.params).id)
        res.status(204).end()
      },
    },
    {
      method: 'put',
      path: '/elements/:id/steps',
      allow: ['director'],
      handler: async (req, res) =>
        res.json(
          await replaceSteps(
            ctx.db,
            req.club,
            idParams.parse(req.params).id,
            stepsUpdateSchema.parse(req.body),
          ),
        ),
    },
    {
      method: 'put',
      path: '/elements/:id/prerequisites',
      allow: ['director'],
      handler: async (req, res) =>
        res.json(
          await replacePrerequisites(
            ctx.db,
            req.club,
            idParams.parse(req.params).id,
            prerequisitesUpdateSchema.parse(req.body).prerequisites,
          ),
        ),
    },
    {
      method: 'get',
      path: '/progression-templates',
      allow: readers,
      handler: async (req, res) => res.json(await listTemplates(ctx.db, req.club.clubId)),
    },
    {
      method: 'put',
      path: '/progression-templates/:family',
      allow: ['director'],
      handler: async (req, res) =>
        res.json(
          await updateTemplate(
            ctx.db,
            req.club,
            familyParams.parse(req.params).family,
            templateUpdateSchema.parse(req.body).steps,
          ),
        ),
    },
  ]
}
