import { NTag, type DataTableColumns } from 'naive-ui'
import { h } from 'vue'
import { RouterLink } from 'vue-router'
import { trampolineDifficultyEdition } from '@shared/domain/catalogue'
import type { CatalogueElement } from '@shared/schemas/elements'
import {
  directionLabels,
  formatDifficulty,
  rotationClassLabels,
  twistBandLabels,
} from './catalogueLabels'

export interface CatalogueColumnContext {
  /** The name of an element of the catalogue by id, for the counterpart link. */
  nameOf: (id: string) => string | undefined
}

// Table cells are rendered outside any scoped style, hence inline.
const muted = 'color: var(--tf-muted); font-weight: normal'

const byNumber =
  (pick: (e: CatalogueElement) => number | null) => (a: CatalogueElement, b: CatalogueElement) =>
    (pick(a) ?? -1) - (pick(b) ?? -1)

function counterpartCell(element: CatalogueElement, context: CatalogueColumnContext) {
  // Sideward elements have no mirror in the forward/backward audit, so they are not a gap.
  if (element.direction === 'sideward') return h('span', { style: muted }, '— sideward')
  if (element.counterpartId === null) {
    return h(NTag, { size: 'small', type: 'warning', bordered: true }, () => 'No counterpart')
  }
  const id = element.counterpartId
  return h(
    RouterLink,
    { to: { name: 'element', params: { id } } },
    () => context.nameOf(id) ?? 'Open',
  )
}

export function catalogueColumns(
  context: CatalogueColumnContext,
): DataTableColumns<CatalogueElement> {
  return [
    {
      title: 'Name',
      key: 'name',
      sorter: (a, b) => a.name.localeCompare(b.name),
      minWidth: 180,
      render: (e) => h(RouterLink, { to: { name: 'element', params: { id: e.id } } }, () => e.name),
    },
    { title: 'Apparatus', key: 'apparatus', sorter: 'default', width: 110 },
    {
      title: 'Direction',
      key: 'direction',
      width: 105,
      render: (e) => directionLabels[e.direction],
    },
    {
      title: () => h('abbr', { title: 'FIG trampoline numeric notation' }, 'Notation'),
      key: 'notation',
      width: 100,
      render: (e) => e.notation ?? '—',
    },
    {
      // The value depends on the code's edition, so the edition is part of the heading.
      title: () =>
        h('span', [
          'Difficulty',
          h('br'),
          h('small', { style: muted }, trampolineDifficultyEdition),
        ]),
      key: 'trampolineDifficulty',
      width: 150,
      sorter: byNumber((e) => e.trampolineDifficulty),
      render: (e) => formatDifficulty(e.trampolineDifficulty),
    },
    {
      title: 'Letter',
      key: 'difficultyLetter',
      width: 90,
      render: (e) =>
        e.difficultyLetter ? `${e.difficultyLetter} (${formatDifficulty(e.difficultyValue)})` : '—',
    },
    {
      title: 'Rotation',
      key: 'rotationClass',
      width: 110,
      render: (e) => rotationClassLabels[e.rotationClass],
    },
    {
      title: 'Twist',
      key: 'twistBand',
      width: 150,
      render: (e) => twistBandLabels[e.twistBand],
    },
    {
      title: 'Counterpart',
      key: 'counterpartId',
      minWidth: 170,
      render: (e) => counterpartCell(e, context),
    },
  ]
}
