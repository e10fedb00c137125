// An athlete's recent pace (net steps gained per 30 days) and a record's steps as of a date, both
// read from the record's timeline (see replayRecord in progress.ts).

import { addDays, replayRecord, type ProgressEvent, type TimelinePoint } from './progress.ts'

/**
 * The athlete's recent pace on one element: net steps gained per 30 days over the `windowDays`
 * days up to and including `asOf`.
 *
 * Net means the step as of `asOf` minus the step as of the day before the window, with never
 * started counting as one below the first step, so a down-step counts against the pace: a
 * step-down after a lost skill and the rebuild that follows add up to nothing gained. The pace is
 * negative when the athlete ended the window lower than they began it. The whole window is the
 * divisor even for an athlete who started within it, which keeps a short history from reading as
 * a fast one.
 */
export function pace(events: readonly ProgressEvent[], asOf: string, windowDays = 180): number {
  return timelinePace(replayRecord(events).timeline, paceWindow(asOf, windowDays))
}

/** The days a pace is measured over: the `days` days up to and including `asOf`. */
export interface PaceWindow {
  /** The day before the window: the step as of then is where the window starts from. */
  before: string
  asOf: string
  days: number
}

export function paceWindow(asOf: string, windowDays = 180): PaceWindow {
  return { before: addDays(asOf, -windowDays), asOf, days: windowDays }
}

/** {@link pace} from a record's timeline; the window is worked out once for many records. */
export function timelinePace(timeline: readonly TimelinePoint[], window: PaceWindow): number {
  return paceOf(netSteps(timeline, window), window)
}

/** The steps a record gained over the window, net (see {@link pace}): a whole number. */
export function netSteps(timeline: readonly TimelinePoint[], window: PaceWindow): number {
  const start = stepsAsOf(timeline, window.before)?.[1] ?? -1
  const end = stepsAsOf(timeline, window.asOf)?.[1] ?? -1
  return end - start
}

/**
 * Steps per 30 days from the net steps gained over the window, on one record or summed over
 * several: summing whole numbers first gives the same pace in whatever order the records come,
 * where adding each record's fraction would round differently from one order to another.
 */
export function paceOf(net: number, window: PaceWindow): number {
  return window.days <= 0 ? 0 : (net / window.days) * 30
}

/**
 * The record's steps at the end of `asOf`, from its timeline: the point with the same step and
 * highest step as `replayRecord(events, { asOf })`. Null when no step had been reached by then.
 */
export function stepsAsOf(timeline: readonly TimelinePoint[], asOf: string): TimelinePoint | null {
  // Timelines are short and audits mostly look at recent dates: search from the end.
  for (let i = timeline.length - 1; i >= 0; i--) {
    const point = timeline[i]!
    if (point[0] <= asOf) return point
  }
  return null
}

/** An athlete's pace over all their elements: the net steps of every element, as one pace. */
export function athletePace(
  histories: Iterable<readonly ProgressEvent[]>,
  asOf: string,
  windowDays = 180,
): number {
  const window = paceWindow(asOf, windowDays)
  let net = 0
  for (const events of histories) net += netSteps(replayRecord(events).timeline, window)
  return paceOf(net, window)
}
