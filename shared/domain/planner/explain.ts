import { modalityLabels } from '../element.ts'
import { needsSpotter, optionAt, stationBlockTurns, turnsPerBlock, workSeconds } from './model.ts'
import type { PlanModel } from './types.ts'

const count = (n: number, one: string, many: string) =>
  `${n === 1 ? 'one' : n} ${n === 1 ? one : many}`

/**
 * Why a request cannot give every athlete present at least one useful turn, in words a coach
 * reads; empty when nothing rules it out before solving. Checks, in order: athletes with nothing
 * to work on, steps no station serves, blocks too short for a turn, spotted steps against the
 * coaches present, and athletes against all the turns the stations give.
 */
export function explainInfeasible(model: PlanModel): string[] {
  const reasons: string[] = []
  const nothing = model.athletes.filter((a) => a.options.length === 0)
  if (nothing.length) {
    reasons.push(
      `${names(nothing)} ${nothing.length === 1 ? 'has' : 'have'} no step to work on among the focus elements.`,
    )
  }
  const unserved = model.athletes.filter(
    (a) => a.options.length > 0 && model.stations.every((s) => optionAt(a, s) === null),
  )
  if (unserved.length) {
    const modalities = [...new Set(unserved.flatMap((a) => a.options.map((o) => o.modality)))]
    reasons.push(
      `${count(unserved.length, 'athlete works', 'athletes work')} on steps done on ${modalities
        .map((m) => modalityLabels[m].toLowerCase())
        .join(', ')}, but no station chosen serves them (${names(unserved)}).`,
    )
  }
  for (const s of model.stations) {
    if (turnsPerBlock(model, s) === 0)
      reasons.push(
        `Blocks leave ${workSeconds(model)} s of work: too short for one turn of ${s.secondsPerTurn} s at ${s.name}.`,
      )
  }
  const spottedOnly = model.athletes.filter(
    (a) =>
      a.options.some(needsSpotter) &&
      model.stations.some((s) => optionAt(a, s) !== null) &&
      model.stations.every((s) => optionAt(a, s) === null || s.needsSpotter),
  )
  if (spottedOnly.length) {
    const spottedTurns = model.stations
      .filter((s) => s.needsSpotter)
      .map((s) => stationBlockTurns(model, s))
      .sort((x, y) => y - x)
      .slice(0, model.coaches)
      .reduce((sum, t) => sum + t, 0)
    const coaches =
      model.coaches === 0
        ? 'no coach is present'
        : `${count(model.coaches, 'coach is', 'coaches are')} present`
    const need = `${count(spottedOnly.length, 'athlete needs', 'athletes need')} a spotter`
    if (model.coaches === 0) reasons.push(`${need} but ${coaches}.`)
    else if (spottedOnly.length > spottedTurns * model.blocks) {
      reasons.push(
        `${need} but ${coaches}: the spotted stations give at most ${spottedTurns * model.blocks} turns in this session.`,
      )
    }
  }
  const turns =
    model.blocks * model.stations.reduce((sum, s) => sum + stationBlockTurns(model, s), 0)
  if (model.athletes.length > turns) {
    reasons.push(
      `${count(model.athletes.length, 'athlete is', 'athletes are')} present but the stations give only ${turns} turns in ${model.minutes} minutes.`,
    )
  }
  return reasons
}

function names(list: { name: string }[]): string {
  const shown = list.slice(0, 5).map((a) => a.name)
  return list.length > 5 ? `${shown.join(', ')} and ${list.length - 5} more` : shown.join(', ')
}
