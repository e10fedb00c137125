import { NTag, type DataTableColumns } from 'naive-ui'
import { h } from 'vue'
import { RouterLink } from 'vue-router'
import type { AuditSummary } from '@shared/schemas/audits'
import { compareLags, formatPercent, formatRatio, formatTimestamp, hashPrefix } from './auditFormat'

// Table cells are rendered outside any scoped style, hence inline.
const muted = 'color: var(--tf-muted)'

/** The list of audits, newest first as the server sends them; each row opens its report. */
export function auditColumns(): DataTableColumns<AuditSummary> {
  return [
    {
      title: 'Scope',
      key: 'scopeName',
      minWidth: 160,
      render: (a) =>
        h(RouterLink, { to: { name: 'audit', params: { id: a.id } } }, () =>
          // the server names a squad's audit by the squad, the club's as "Whole club"
          a.squadId === null ? 'Whole club' : `Squad: ${a.scopeName}`,
        ),
    },
    { title: 'As of', key: 'asOf', width: 110, sorter: (a, b) => a.asOf.localeCompare(b.asOf) },
    {
      title: 'Created',
      key: 'createdAt',
      width: 150,
      render: (a) =>
        a.rerun
          ? h('span', [
              formatTimestamp(a.createdAt),
              ' ',
              h(
                NTag,
                { size: 'small', title: 'Another audit of this scope and date was run before' },
                () => 'Re-run',
              ),
            ])
          : formatTimestamp(a.createdAt),
    },
    {
      title: 'Published',
      key: 'publishedAt',
      width: 130,
      render: (a) =>
        a.publishedAt === null
          ? h('span', { style: muted }, 'Not published')
          : h(NTag, { size: 'small', type: 'success' }, () => a.publishedAt!.slice(0, 10)),
    },
    {
      title: 'Athletes',
      key: 'athleteCount',
      width: 90,
      align: 'right',
    },
    {
      title: 'Front-lag',
      key: 'clubFrontLag',
      width: 100,
      align: 'right',
      sorter: (a, b) => compareLags(a.clubFrontLag, b.clubFrontLag),
      render: (a) => formatPercent(a.clubFrontLag),
    },
    {
      title: 'Balance ratio',
      key: 'balanceRatio',
      width: 115,
      align: 'right',
      render: (a) => formatRatio(a.balanceRatio),
    },
    {
      title: 'Inputs hash',
      key: 'inputHash',
      width: 130,
      render: (a) => h('code', { title: a.inputHash }, hashPrefix(a.inputHash)),
    },
  ]
}
