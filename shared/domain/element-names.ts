// How elements are named in lists that mix apparatus.

const nameKey = (name: string) => name.trim().toLowerCase()

/**
 * The name each element is shown by where elements of several apparatus meet (gap lists, the
 * report, the missing-skills list): its own name, with its apparatus added when an element of the
 * same name sits on another apparatus, so "Back tuck (floor)" and "Back tuck (trampoline)" are
 * told apart. Names compare without case or surrounding spaces; a name used on one apparatus only
 * stays as it is.
 */
export function displayNames(
  elements: readonly { id: string; name: string; apparatus: string }[],
): Map<string, string> {
  const apparatusByName = new Map<string, Set<string>>()
  for (const e of elements) {
    const key = nameKey(e.name)
    const set = apparatusByName.get(key) ?? new Set<string>()
    set.add(e.apparatus.trim().toLowerCase())
    apparatusByName.set(key, set)
  }
  return new Map(
    elements.map((e) => [
      e.id,
      apparatusByName.get(nameKey(e.name))!.size > 1
        ? `${e.name.trim()} (${e.apparatus.trim()})`
        : e.name,
    ]),
  )
}
