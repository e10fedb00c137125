import type { ElementInput } from '../shared/schemas/elements.ts'

/**
 * The demo club's own elements beside the standard catalogue. All three are backward skills
 * whose forward mirror the club has not added, so the catalogue-gap panel has something to show.
 */
export const demoClubElements: ElementInput[] = [
  {
    name: 'Double back layout, 1½ out',
    apparatus: 'floor',
    direction: 'backward',
    quarterRotations: 8,
    twists: [0, 3],
    shape: 'straight',
    takeOff: 'round-off',
    notes: 'Senior floor pass of the Harriers squad.',
  },
  {
    name: 'Triple back tuck',
    apparatus: 'tumbling',
    direction: 'backward',
    quarterRotations: 12,
    twists: [0, 0, 0],
    shape: 'tuck',
    takeOff: 'back-handspring',
  },
  {
    name: 'Double back tuck, 1½ in',
    apparatus: 'tumbling',
    direction: 'backward',
    quarterRotations: 8,
    twists: [3, 0],
    shape: 'tuck',
    takeOff: 'back-handspring',
  },
]
