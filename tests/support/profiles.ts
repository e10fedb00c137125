/**
 * A requirement profile body for tests: senior tumblers should have a double salto at the
 * competition-ready step (from memory, as the profile itself says). Add an `id` to create one.
 */
export const doubleSaltoProfile = (label: string) => ({
  label,
  discipline: 'tumbling',
  apparatus: 'tumbling',
  categories: ['senior'],
  source: 'from memory',
  requirements: [
    {
      id: 'double',
      label: 'A double salto',
      source: 'from memory',
      matches: { minRotationClass: 'double' },
      minStepIndex: 'competition-ready',
    },
  ],
})
