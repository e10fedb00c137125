/** Roles a person can hold in a club; what each may do is decided on the server. */
export const roles = ['director', 'coach', 'clinician', 'board'] as const
export type Role = (typeof roles)[number]

/** Disciplines a squad or athlete trains for; the age-category rules differ between them. */
export const disciplines = ['artistic-women', 'artistic-men', 'tumbling', 'trampoline'] as const
export type Discipline = (typeof disciplines)[number]

export const disciplineLabels: Record<Discipline, string> = {
  'artistic-women': "Women's artistic",
  'artistic-men': "Men's artistic",
  tumbling: 'Tumbling',
  trampoline: 'Trampoline',
}

/** Squad levels from the youngest group to the competitive top. */
export const squadLevels = ['development', 'intermediate', 'junior', 'senior'] as const
export type SquadLevel = (typeof squadLevels)[number]

/** How each role is named to people. */
export const roleLabels: Record<Role, string> = {
  director: 'technical director',
  coach: 'coach',
  clinician: 'visiting clinician',
  board: 'board member',
}
