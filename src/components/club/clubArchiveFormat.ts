import type { ArchivePhase } from '@shared/schemas/archives'

const phaseLabels: Record<ArchivePhase, string> = {
  queued: 'Waiting to start',
  club: 'The club',
  people: 'Members',
  squads: 'Squads and coach assignments',
  athletes: 'Athletes',
  catalogue: 'Catalogue and progressions',
  progress: 'Progress history and records',
  settings: 'Requirement profiles and age bands',
  audits: 'Audits',
  manifest: 'Writing the manifest',
  done: 'Done',
}

/** An archive's phase in words; an unknown phase is shown as the server names it. */
export const archivePhaseLabel = (phase: string) =>
  (phaseLabels as Record<string, string>)[phase] ?? phase

/** A file size as people read it: 812 bytes, 14 kB, 3.2 MB. */
export function fileSize(bytes: number) {
  if (bytes < 1000) return `${bytes} bytes`
  if (bytes < 1_000_000) return `${Math.round(bytes / 1000)} kB`
  return `${(bytes / 1_000_000).toFixed(1)} MB`
}
