// The session planner's pure domain: the model, its program for the solver, the block layout,
// the turns, the figures, the explanations and the ratio warnings.
export * from './types.ts'
export * from './model.ts'
export * from './bound.ts'
export * from './lp.ts'
export * from './schedule.ts'
export * from './turns.ts'
export * from './figures.ts'
export * from './explain.ts'
export * from './ratios.ts'
