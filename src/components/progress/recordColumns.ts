import { type DataTableColumns } from 'naive-ui'
import { h } from 'vue'
import type { RecordDetail, RecordView } from '@shared/schemas/progress'
import type { ElementSummary } from '@/stores/athleteProgress'
import { directionLabels, pauseReasonLabels, stepFraction } from './progressFormat'

export interface RecordColumnContext {
  element: (elementId: string) => ElementSummary | undefined
  /** Step names come with the record's detail, once loaded. */
  detail: (elementId: string) => RecordDetail | undefined
}

const muted = 'color: var(--tf-muted)'

export function recordColumns(context: RecordColumnContext): DataTableColumns<RecordView> {
  const nameOf = (r: RecordView) =>
    context.element(r.elementId)?.name ?? 'Element no longer in the catalogue'
  return [
    {
      title: 'Element',
      key: 'element',
      minWidth: 180,
      sorter: (a, b) => nameOf(a).localeCompare(nameOf(b)),
      render: (r) => {
        const e = context.element(r.elementId)
        const extra = [e?.apparatus, e?.notation].filter(Boolean).join(' · ')
        return h('span', [nameOf(r), extra ? h('span', { style: muted }, ` · ${extra}`) : null])
      },
    },
    {
      title: 'Direction',
      key: 'direction',
      width: 100,
      render: (r) => {
        const e = context.element(r.elementId)
        return e ? directionLabels[e.direction] : '—'
      },
    },
    {
      title: 'Step reached',
      key: 'stepIndex',
      minWidth: 180,
      render: (r) => {
        const e = context.element(r.elementId)
        const steps = context.detail(r.elementId)?.steps
        const count = steps?.length ?? e?.stepCount ?? 0
        const name = r.stepIndex === null ? undefined : steps?.[r.stepIndex]?.name
        return h('span', [
          h('strong', stepFraction(r.stepIndex, count)),
          name ? h('span', { style: muted }, ` · ${name}`) : null,
        ])
      },
    },
    {
      title: 'State',
      key: 'paused',
      width: 130,
      render: (r) => {
        const parts: string[] = []
        if (r.paused)
          parts.push(
            `‖ Paused${r.pauseReason ? ` (${pauseReasonLabels[r.pauseReason].toLowerCase()})` : ''}`,
          )
        if (r.flagged) parts.push('! Flagged')
        return parts.length > 0 ? parts.join(' · ') : 'Training'
      },
    },
    { title: 'Last entry', key: 'lastEventOn', width: 115, sorter: 'default' },
  ]
}
