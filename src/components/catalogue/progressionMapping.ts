/**
 * Where the athletes on each old step are proposed to go when a progression's steps change:
 * the same step where it was kept, else the kept step before it, else the first step. Moving
 * back rather than forward is the safe default, since an athlete must never be advanced past a
 * criterion they have not met.
 *
 * `oldStepCount` is the number of steps in the saved progression; `origins[newIndex]` is the
 * index in the saved progression the new step came from, or null for a new step. The answer is
 * indexed by old step and holds the new step's index.
 */
export function suggestMapping(oldStepCount: number, origins: (number | null)[]): number[] {
  const newIndexOf = new Map<number, number>()
  origins.forEach((origin, newIndex) => {
    if (origin !== null) newIndexOf.set(origin, newIndex)
  })
  return Array.from({ length: oldStepCount }, (_, oldIndex) => {
    for (let k = oldIndex; k >= 0; k--) {
      const found = newIndexOf.get(k)
      if (found !== undefined) return found
    }
    return 0
  })
}
