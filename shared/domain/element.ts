// The vocabulary of the element model. Every derivation built on it lives beside it in
// shared/domain/ as pure functions.

export const directions = ['forward', 'backward', 'sideward'] as const
export type Direction = (typeof directions)[number]

/** Body shape during the salto. Non-salto elements (handsprings, walkovers) have none. */
export const shapes = ['tuck', 'pike', 'straight'] as const
export type Shape = (typeof shapes)[number]

/** The standard apparatus; a club may add its own names beside these. */
export const standardApparatus = ['floor', 'tumbling', 'trampoline'] as const

export const takeOffs = [
  'standing',
  'round-off',
  'front-handspring',
  'back-handspring',
  'punch',
  'trampoline-bounce',
] as const
export type TakeOff = (typeof takeOffs)[number]

export const rotationClasses = ['none', 'single', 'double', 'triple'] as const
export type RotationClass = (typeof rotationClasses)[number]

export const twistBands = ['none', 'half', 'full', 'more'] as const
export type TwistBand = (typeof twistBands)[number]

/** The rotation classes and twist bands in words, for screens, exports and the PDF alike. */
export const rotationClassLabels: Record<RotationClass, string> = {
  none: 'No salto',
  single: 'Single',
  double: 'Double',
  triple: 'Triple or more',
}

export const twistBandLabels: Record<TwistBand, string> = {
  none: 'No twist',
  half: 'Half twist',
  full: 'Full twist',
  more: 'More than a full twist',
}

/** Equipment or setting a progression step is done in. */
export const modalities = [
  'floor-drill',
  'trampoline',
  'tumble-track',
  'pit',
  'soft-mat',
  'spotting-rig',
  'hand-spot',
  'floor-solo',
  'routine',
] as const
export type Modality = (typeof modalities)[number]

export const modalityLabels: Record<Modality, string> = {
  'floor-drill': 'Floor drills and timers',
  trampoline: 'Trampoline',
  'tumble-track': 'Tumble track',
  pit: 'Mini-trampoline into the foam pit',
  'soft-mat': 'Onto a soft landing mat',
  'spotting-rig': 'Spotting rig / twisting belt',
  'hand-spot': 'Hand spot by a coach',
  'floor-solo': 'Solo on the floor',
  routine: 'In a competition routine',
}

/** The caution shown wherever Twofold suggests a step, a regression or a plan. */
export const safetyCaution =
  "Progressions are guidance for qualified coaches. Spotting and equipment follow the national federation's rules and local regulations; never advance an athlete who has not met the step's criterion."
