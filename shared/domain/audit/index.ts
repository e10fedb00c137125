// The audit, by concern: types, formulas, run, readiness, comparison, hashing. Import from the
// module of the concern; this index is for callers that want the whole of it.

export * from './types.ts'
export * from './formulas.ts'
export * from './readiness.ts'
export * from './run.ts'
export * from './comparison.ts'
export * from './hashing.ts'
