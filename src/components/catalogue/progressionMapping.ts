/**
 * Where the athletes on each old step are proposed to go when a progression's steps change.
 * Athletes on an old step have passed it and every old step before it; they are proposed the
 * furthest kept step they can reach with only those passed, in the new order: the last kept step
 * before the first one that was after theirs in the saved progression. So a removed step sends
 * its athletes back to the kept step before it, and a reorder never puts athletes past a step
 * they had not passed; when even the new first step is one they had not passed, the proposal is
 * the first step, the lowest there is. A new step does not hold athletes back by itself (those
 * already past its place keep their step); the coach, who confirms every row, decides who must
 * go through it. Moving back rather than forward is the safe default, since an athlete must
 * never be advanced past a criterion they have not met.
 *
 * `oldStepCount` is the number of steps in the saved progression; `origins[newIndex]` is the
 * index in the saved progression the new step came from, or null for a new step. The answer is
 * indexed by old step and holds the new step's index.
 */
export function suggestMapping(oldStepCount: number, origins: (number | null)[]): number[] {
  return Array.from({ length: oldStepCount }, (_, oldIndex) => {
    let proposed = 0
    for (const [newIndex, origin] of origins.entries()) {
      if (origin === null) continue
      if (origin > oldIndex) break
      proposed = newIndex
    }
    return proposed
  })
}
