// Progression templates a club starts from, one per element family. These follow common practice
// (no published source): drills and timers first, then equipment that takes load and fear out of
// the skill (trampoline, tumble track, foam pit, rig, soft mat), then a hand spot, then solo, then
// the routine. Clubs edit them; the criteria are written to be checked on the gym floor.

import type { ProgressionStep } from '../schemas/progressions.ts'
import { rotationClass, totalHalfTwists, twistBand, type ElementDescription } from './catalogue.ts'

export const templateFamilies = [
  'handspring-walkover',
  'single-salto',
  'twisting-single',
  'double-salto',
  'twisting-double',
  'triple-salto',
  'trampoline-single',
  'trampoline-twisting-single',
  'trampoline-double',
  'trampoline-twisting-double',
  'triple-trampoline',
] as const
export type TemplateFamily = (typeof templateFamilies)[number]

export interface ProgressionTemplate {
  family: TemplateFamily
  label: string
  steps: readonly ProgressionStep[]
}

const competitionReady: ProgressionStep = {
  name: 'Competition-ready in a routine',
  modality: 'routine',
  criterion:
    'Performs it in a full routine or pass at two sessions in a row with no fall, no touch of the hands and no help.',
}

const trampolineCompetitionReady: ProgressionStep = {
  name: 'Competition-ready in a routine',
  modality: 'routine',
  criterion:
    'Performs it within a full ten-element routine at two sessions in a row, landing inside the centre zone with no extra bounce.',
}

// Steps shared by the floor and tumbling families once the skill leaves the soft equipment.
const pitWithSpotter: ProgressionStep = {
  name: 'Into the foam pit with a spotter',
  modality: 'pit',
  criterion:
    "From the tumble track or mini-trampoline, completes 5 in a row into the pit landing feet first, the spotter's hands only guiding.",
  minDays: 7,
}
const pitAlone: ProgressionStep = {
  name: 'Into the foam pit alone',
  modality: 'pit',
  criterion:
    'Completes 8 of 10 into the pit unassisted, opening out before the landing and landing feet first every time.',
  minDays: 7,
}
const softMat: ProgressionStep = {
  name: 'Onto a soft landing mat',
  modality: 'soft-mat',
  criterion:
    'Completes 8 of 10 onto the soft landing mat landing on the feet, without sitting down or putting a hand down.',
  minDays: 7,
}
const handSpotFloor: ProgressionStep = {
  name: 'Hand spot on the floor',
  modality: 'hand-spot',
  criterion:
    'Completes 5 in a row on the floor with a light hand spot, the coach carrying none of the weight, landing in balance.',
  minDays: 7,
}
const soloFloor: ProgressionStep = {
  name: 'Solo on the floor',
  modality: 'floor-solo',
  criterion:
    'Completes 8 of 10 solo on the floor landing on the feet with the chest up and no more than one small step.',
  minDays: 14,
}

export const progressionTemplates: Record<TemplateFamily, ProgressionTemplate> = {
  'handspring-walkover': {
    family: 'handspring-walkover',
    label: 'Handsprings and walkovers',
    steps: [
      {
        name: 'Floor drills: bridge, handstand, lunge',
        modality: 'floor-drill',
        criterion:
          'Holds a bridge with straight arms for 10 seconds and a hollow handstand against the wall for 20 seconds.',
        minDays: 7,
      },
      {
        name: 'On the tumble track',
        modality: 'tumble-track',
        criterion:
          'Completes 5 in a row on the tumble track with straight arms and an active push through the shoulders.',
        minDays: 7,
      },
      {
        name: 'Over a wedge onto a soft mat',
        modality: 'soft-mat',
        criterion:
          'Completes 5 in a row over the wedge onto the soft mat without the arms bending or the head dropping.',
      },
      handSpotFloor,
      soloFloor,
      competitionReady,
    ],
  },
  'single-salto': {
    family: 'single-salto',
    label: 'Single saltos',
    steps: [
      {
        name: 'Floor drills and timers',
        modality: 'floor-drill',
        criterion:
          'Holds the shape for 5 seconds and shows 5 set jumps with the arms up and the chest lifted, timers landing on a raised mat.',
        minDays: 7,
      },
      {
        name: 'On the trampoline with a spotter',
        modality: 'trampoline',
        criterion:
          'Completes 5 in a row on the trampoline with the coach spotting, landing on the feet in the middle of the bed.',
        minDays: 7,
      },
      pitWithSpotter,
      pitAlone,
      softMat,
      handSpotFloor,
      soloFloor,
      competitionReady,
    ],
  },
  'twisting-single': {
    family: 'twisting-single',
    label: 'Twisting single saltos',
    steps: [
      {
        name: 'Floor drills: twist jumps and straight body',
        modality: 'floor-drill',
        criterion:
          'Shows 5 jumps with the full twist and the arms wrapped tight, landing facing the right way, and holds a hollow straight body for 10 seconds.',
        minDays: 7,
      },
      {
        name: 'In the twisting belt on the trampoline',
        modality: 'spotting-rig',
        criterion:
          'Completes 5 in a row in the twisting belt with the twist finished before the landing and the arms wrapped.',
        minDays: 7,
      },
      {
        name: 'Solo on the trampoline',
        modality: 'trampoline',
        criterion:
          'Completes 8 of 10 on the trampoline unassisted, landing on the feet facing the right way.',
        minDays: 7,
      },
      pitAlone,
      softMat,
      handSpotFloor,
      soloFloor,
      competitionReady,
    ],
  },
  'double-salto': {
    family: 'double-salto',
    label: 'Double saltos',
    steps: [
      {
        name: 'Floor drills and timers',
        modality: 'floor-drill',
        criterion:
          'Shows 5 timers (the single salto with the set of the double) landing high on a raised mat, and holds the tight shape for 5 seconds.',
        minDays: 14,
      },
      {
        name: 'In the spotting rig on the trampoline',
        modality: 'spotting-rig',
        criterion:
          'Completes 5 doubles in a row in the rig with the shape held through both saltos, landing on the feet.',
        minDays: 14,
      },
      pitWithSpotter,
      { ...pitAlone, minDays: 14 },
      { ...softMat, minDays: 14 },
      handSpotFloor,
      { ...soloFloor, minDays: 21 },
      competitionReady,
    ],
  },
  'twisting-double': {
    family: 'twisting-double',
    label: 'Twisting double saltos',
    steps: [
      {
        name: 'Floor drills and timers',
        modality: 'floor-drill',
        criterion:
          'Lands the untwisted double solo and shows 5 timers with the twist set in the right salto, landing on a raised mat.',
        minDays: 14,
      },
      {
        name: 'In the twisting belt on the trampoline',
        modality: 'spotting-rig',
        criterion:
          'Completes 5 in a row in the twisting belt with the twist in the right salto and finished before the landing.',
        minDays: 14,
      },
      pitWithSpotter,
      { ...pitAlone, minDays: 14 },
      { ...softMat, minDays: 14 },
      handSpotFloor,
      { ...soloFloor, minDays: 21 },
      competitionReady,
    ],
  },
  'triple-salto': {
    family: 'triple-salto',
    label: 'Triple saltos (floor and tumbling)',
    steps: [
      {
        name: 'Floor drills and timers',
        modality: 'floor-drill',
        criterion:
          'Lands 5 doubles in a row from the same take-off early and high on a raised mat, with rotation to spare.',
        minDays: 21,
      },
      {
        name: 'In the spotting rig on the trampoline',
        modality: 'spotting-rig',
        criterion:
          'Completes 5 triples in a row in the rig with the shape held to the end, landing on the feet.',
        minDays: 21,
      },
      { ...pitWithSpotter, minDays: 21 },
      { ...pitAlone, minDays: 28 },
      { ...softMat, minDays: 28 },
      { ...soloFloor, minDays: 28 },
      competitionReady,
    ],
  },
  'trampoline-single': {
    family: 'trampoline-single',
    label: 'Trampoline single somersaults',
    steps: [
      {
        name: 'Shape drills and timers',
        modality: 'floor-drill',
        criterion:
          'Holds the shape for 5 seconds and shows 10 controlled straight jumps in a row inside the centre zone.',
        minDays: 7,
      },
      {
        name: 'With a hand spot on the trampoline',
        modality: 'hand-spot',
        criterion:
          'Completes 5 in a row with the coach spotting from the bed, landing on the feet in the centre.',
        minDays: 7,
      },
      {
        name: 'With a push-in mat',
        modality: 'soft-mat',
        criterion:
          'Completes 5 in a row as the coach pushes in the soft mat, landing on the feet without falling forward or back.',
        minDays: 7,
      },
      {
        name: 'Solo on the trampoline',
        modality: 'trampoline',
        criterion:
          'Completes 8 of 10 solo, landing on the feet inside the centre zone and bouncing on under control.',
        minDays: 14,
      },
      trampolineCompetitionReady,
    ],
  },
  'trampoline-twisting-single': {
    family: 'trampoline-twisting-single',
    label: 'Trampoline twisting somersaults',
    steps: [
      {
        name: 'Twist jumps and timers',
        modality: 'trampoline',
        criterion:
          'Shows 5 jumps with the full twist in a row, arms wrapped, landing facing forward inside the centre zone.',
        minDays: 7,
      },
      {
        name: 'In the twisting belt',
        modality: 'spotting-rig',
        criterion:
          'Completes 5 in a row in the twisting belt with the twist finished before the landing.',
        minDays: 7,
      },
      {
        name: 'With a push-in mat',
        modality: 'soft-mat',
        criterion:
          'Completes 5 in a row as the coach pushes in the soft mat, landing on the feet facing the right way.',
        minDays: 7,
      },
      {
        name: 'Solo on the trampoline',
        modality: 'trampoline',
        criterion:
          'Completes 8 of 10 solo, landing on the feet inside the centre zone facing the right way.',
        minDays: 14,
      },
      trampolineCompetitionReady,
    ],
  },
  'trampoline-double': {
    family: 'trampoline-double',
    label: 'Trampoline double somersaults',
    steps: [
      {
        name: 'Timers',
        modality: 'trampoline',
        criterion:
          'Shows 5 timers in a row (the single somersault with the height and set of the double) landing in the centre zone.',
        minDays: 14,
      },
      {
        name: 'In the overhead rig',
        modality: 'spotting-rig',
        criterion:
          'Completes 5 doubles in a row in the rig with the shape held through both somersaults, landing on the feet.',
        minDays: 14,
      },
      {
        name: 'With a push-in mat',
        modality: 'soft-mat',
        criterion:
          'Completes 5 doubles in a row as the coach pushes in the soft mat, landing on the feet.',
        minDays: 14,
      },
      {
        name: 'Solo on the trampoline',
        modality: 'trampoline',
        criterion:
          'Completes 8 of 10 solo, landing on the feet inside the centre zone and bouncing on under control.',
        minDays: 21,
      },
      trampolineCompetitionReady,
    ],
  },
  'trampoline-twisting-double': {
    family: 'trampoline-twisting-double',
    label: 'Trampoline twisting double somersaults',
    steps: [
      {
        name: 'Timers with the twist set',
        modality: 'trampoline',
        criterion:
          'Lands the untwisted double solo and shows 5 timers with the twist set in the right somersault.',
        minDays: 14,
      },
      {
        name: 'In the twisting rig',
        modality: 'spotting-rig',
        criterion:
          'Completes 5 in a row in the twisting rig with the twist in the right somersault, landing on the feet.',
        minDays: 14,
      },
      {
        name: 'With a push-in mat',
        modality: 'soft-mat',
        criterion:
          'Completes 5 in a row as the coach pushes in the soft mat, landing on the feet facing the right way.',
        minDays: 14,
      },
      {
        name: 'Solo on the trampoline',
        modality: 'trampoline',
        criterion:
          'Completes 8 of 10 solo, landing on the feet inside the centre zone facing the right way.',
        minDays: 21,
      },
      trampolineCompetitionReady,
    ],
  },
  'triple-trampoline': {
    family: 'triple-trampoline',
    label: 'Trampoline triple somersaults',
    steps: [
      {
        name: 'Timers',
        modality: 'trampoline',
        criterion:
          'Lands 5 doubles in a row with rotation to spare and the height the triple needs, inside the centre zone.',
        minDays: 21,
      },
      {
        name: 'In the overhead rig',
        modality: 'spotting-rig',
        criterion:
          'Completes 5 triples in a row in the rig with the shape held to the end, landing on the feet.',
        minDays: 28,
      },
      {
        name: 'With a push-in mat',
        modality: 'soft-mat',
        criterion:
          'Completes 5 triples in a row as the coach pushes in the soft mat, landing on the feet.',
        minDays: 28,
      },
      {
        name: 'Solo on the trampoline',
        modality: 'trampoline',
        criterion:
          'Completes 8 of 10 solo, landing on the feet inside the centre zone and bouncing on under control.',
        minDays: 28,
      },
      trampolineCompetitionReady,
    ],
  },
}

/**
 * The template family an element starts from, chosen from its derived fields: the rotation class
 * and whether it twists, on the trampoline or elsewhere. Tumbling and a club's own apparatus
 * follow the floor families, whose steps move from soft equipment to a hard surface. Non-salto
 * elements take the handspring and walkover family on any apparatus.
 */
export function templateFamilyFor(
  element: Pick<ElementDescription, 'apparatus' | 'quarterRotations' | 'twists'>,
): TemplateFamily {
  const rotation = rotationClass(element.quarterRotations)
  const twisting = twistBand(totalHalfTwists(element.twists)) !== 'none'
  const trampoline = element.apparatus === 'trampoline'
  switch (rotation) {
    case 'none':
      return 'handspring-walkover'
    case 'single':
      if (trampoline) return twisting ? 'trampoline-twisting-single' : 'trampoline-single'
      return twisting ? 'twisting-single' : 'single-salto'
    case 'double':
      if (trampoline) return twisting ? 'trampoline-twisting-double' : 'trampoline-double'
      return twisting ? 'twisting-double' : 'double-salto'
    case 'triple':
      return trampoline ? 'triple-trampoline' : 'triple-salto'
  }
}

/** The template an element starts from; see {@link templateFamilyFor}. */
export function templateFor(
  element: Pick<ElementDescription, 'apparatus' | 'quarterRotations' | 'twists'>,
): ProgressionTemplate {
  return progressionTemplates[templateFamilyFor(element)]
}
