/** Lower-case letters, digits and single dashes, as club slugs are. */
export function slugify(text: string, maxLength: number) {
  return (
    text
      // Accents come off rather than turning into dashes: "Étoile" → "etoile".
      .normalize('NFKD')
      .replace(/[\u0300-\u036f]/g, '')
      .toLowerCase()
      // An apostrophe joins its word, so "St Mary's" reads "st-marys", not "st-mary-s".
      .replace(/['’]/g, '')
      .replace(/[^a-z0-9]+/g, '-')
      .replace(/^-+/, '')
      .slice(0, maxLength)
      .replace(/-+$/, '')
  )
}

/** The longest slug a club may have. */
export const clubSlugMaxLength = 60

/**
 * The slug of a new club, derived from its name and free among `taken`: "-2", "-3"… are added
 * when it is used. A name with nothing to keep (only punctuation, or a script without Latin
 * letters) gives "club".
 */
export function clubSlugFromName(name: string, taken: Iterable<string>): string {
  const used = new Set(taken)
  const base = slugify(name, clubSlugMaxLength) || 'club'
  if (!used.has(base)) return base
  for (let n = 2; ; n++) {
    const suffix = `-${n}`
    const stem = base.slice(0, clubSlugMaxLength - suffix.length).replace(/-+$/, '')
    if (!used.has(`${stem}${suffix}`)) return `${stem}${suffix}`
  }
}
