/**
 * A step index recorded under an older version of an element's progression, read in the current
 * one. Each change of steps made while athletes were on the element left a mapping
 * (mapping[oldIndex] = newIndex) from its version to the next; they are applied in order.
 * Without a mapping for a version (the steps changed while nobody was on them) the index stays,
 * capped at the last step of the mapping that follows, if any.
 */
export function translateStepIndex(
  index: number,
  fromVersion: number,
  toVersion: number,
  maps: ReadonlyMap<number, readonly number[]>,
): number {
  let current = index
  for (let version = fromVersion; version < toVersion; version++) {
    const mapping = maps.get(version)
    if (!mapping || mapping.length === 0) continue
    current = mapping[Math.min(current, mapping.length - 1)]!
  }
  return current
}
