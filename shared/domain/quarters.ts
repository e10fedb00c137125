/** The last day of a calendar quarter written `YYYY-Qn`, as YYYY-MM-DD. */
export function quarterEnd(quarter: string): string {
  const match = /^(\d{4})-Q([1-4])$/.exec(quarter)
  if (!match) throw new Error(`Not a quarter: ${quarter}`)
  const year = Number(match[1])
  const month = Number(match[2]) * 3
  // Day 0 of the next month is the last day of this one.
  return new Date(Date.UTC(year, month, 0)).toISOString().slice(0, 10)
}

/** The quarter a date falls in, `YYYY-Qn`. */
export function quarterOf(isoDate: string): string {
  const [year, month] = isoDate.split('-').map(Number) as [number, number]
  return `${year}-Q${Math.ceil(month / 3)}`
}

/** The calendar quarter before `quarter` (`YYYY-Qn`). */
export function previousQuarter(quarter: string): string {
  const match = /^(\d{4})-Q([1-4])$/.exec(quarter)
  if (!match) throw new Error(`Not a quarter: ${quarter}`)
  const year = Number(match[1])
  const n = Number(match[2])
  return n === 1 ? `${year - 1}-Q4` : `${year}-Q${n - 1}`
}
