import type { DbOrTx } from '../server/db/client.ts'
import { createStation } from '../server/services/planner.ts'

/** The demo gym's stations, so that a coach can plan a session at once. */
export const demoStations = [
  {
    name: 'Trampoline 1',
    modality: 'trampoline',
    capacity: 1,
    secondsPerTurn: 45,
    needsSpotter: false,
  },
  {
    name: 'Trampoline 2',
    modality: 'trampoline',
    capacity: 1,
    secondsPerTurn: 45,
    needsSpotter: false,
  },
  {
    name: 'Tumble track',
    modality: 'tumble-track',
    capacity: 2,
    secondsPerTurn: 20,
    needsSpotter: false,
  },
  {
    name: 'Mini-tramp into the pit',
    modality: 'pit',
    capacity: 1,
    secondsPerTurn: 25,
    needsSpotter: false,
  },
  {
    name: 'Landing mat strip',
    modality: 'soft-mat',
    capacity: 2,
    secondsPerTurn: 30,
    needsSpotter: false,
  },
  {
    name: 'Floor drills corner',
    modality: 'floor-drill',
    capacity: 4,
    secondsPerTurn: 20,
    needsSpotter: false,
  },
  {
    name: 'Twisting belt',
    modality: 'spotting-rig',
    capacity: 1,
    secondsPerTurn: 60,
    needsSpotter: true,
  },
  {
    name: 'Coach spot on the floor',
    modality: 'hand-spot',
    capacity: 1,
    secondsPerTurn: 30,
    needsSpotter: true,
  },
  {
    name: 'Floor, solo',
    modality: 'floor-solo',
    capacity: 3,
    secondsPerTurn: 25,
    needsSpotter: false,
  },
] as const

export async function demoStationsFor(db: DbOrTx, clubId: string) {
  for (const station of demoStations) await createStation(db, clubId, station)
}
