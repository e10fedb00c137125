// The worked example the audit's tests share: a small catalogue and four athletes whose
// proficiencies are worked out by hand beside their records.

import type {
  AuditAthlete,
  AuditElement,
  AuditInputs,
  AuditRecord,
} from '../../shared/domain/audit/types.ts'

export const el = (
  id: string,
  direction: AuditElement['direction'],
  rotationClass: AuditElement['rotationClass'],
  twistBand: AuditElement['twistBand'],
  counterpartId: string | null,
  stepCount: number,
): AuditElement => ({
  id,
  name: id.toUpperCase(),
  apparatus: 'floor',
  direction,
  rotationClass,
  twistBand,
  counterpartId,
  stepCount,
})

export const elements: AuditElement[] = [
  el('bt', 'backward', 'single', 'none', 'ft', 5), // back tuck
  el('ft', 'forward', 'single', 'none', 'bt', 5), // front tuck
  el('bp', 'backward', 'single', 'none', 'fp', 4), // back pike
  el('fp', 'forward', 'single', 'none', 'bp', 4), // front pike
  el('bf', 'backward', 'single', 'full', 'ff', 6), // back full
  el('ff', 'forward', 'single', 'full', 'bf', 4), // front full, a shorter progression
  el('bdt', 'backward', 'double', 'none', 'fdt', 8), // double back; front double not in catalogue
  el('bwo', 'backward', 'none', 'none', null, 3), // back walkover; no counterpart at all
  el('ss', 'sideward', 'single', 'none', null, 4), // side salto
]

export const athletes: AuditAthlete[] = [
  { id: 'ana', squadId: 'squad-a', birthYear: 2011, discipline: 'artistic-women' },
  { id: 'ben', squadId: 'squad-a', birthYear: 2012, discipline: 'artistic-women' },
  { id: 'cai', squadId: 'squad-b', birthYear: 2013, discipline: 'artistic-men' },
  { id: 'dee', squadId: 'squad-b', birthYear: 2010, discipline: 'artistic-women' },
]

export const rec = (
  athleteId: string,
  elementId: string,
  stepIndex: number | null,
): AuditRecord => ({
  athleteId,
  elementId,
  stepIndex,
})

export const records: AuditRecord[] = [
  // ana: p(bt) = 5/5 = 1, p(ft) = 3/5 = 0.6, p(bf) = 3/6 = 0.5, p(ff) = 2/4 = 0.5 (a tie),
  // p(bdt) = 2/8 = 0.25 with its counterpart missing from the catalogue
  rec('ana', 'bt', 4),
  rec('ana', 'ft', 2),
  rec('ana', 'bf', 2),
  rec('ana', 'ff', 1),
  rec('ana', 'bdt', 1),
  // ben: only forward progress, p(ft) = 2/5 = 0.4; the side salto p(ss) = 4/4 = 1 is sideward
  rec('ben', 'ft', 1),
  rec('ben', 'ss', 3),
  // cai: a record with no step, which is no progress at all
  rec('cai', 'bt', null),
  // dee: only backward progress, p(bt) = 4/5 = 0.8, p(bp) = 1/4 = 0.25, p(bwo) = 2/3
  rec('dee', 'bt', 3),
  rec('dee', 'bp', 0),
  rec('dee', 'bwo', 1),
]

export const asOf = '2025-09-15'
export const inputs: AuditInputs = { asOf, elements, athletes, records, paces: { dee: 1.5 } }
