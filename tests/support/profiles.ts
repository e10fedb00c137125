import type { AgeCategory } from '../../shared/domain/age-categories.ts'

/**
 * A requirement profile body for tests: tumblers of the categories given (seniors unless told)
 * should have a double salto at the competition-ready step (from memory, as the profile itself
 * says). Add an `id` to create one.
 */
export const doubleSaltoProfile = (label: string, categories: AgeCategory[] = ['senior']) => ({
  label,
  discipline: 'tumbling' as const,
  apparatus: 'tumbling',
  categories,
  source: 'from memory',
  requirements: [
    {
      id: 'double',
      label: 'A double salto',
      source: 'from memory',
      matches: { minRotationClass: 'double' as const },
      minStepIndex: 'competition-ready' as const,
    },
  ],
})
