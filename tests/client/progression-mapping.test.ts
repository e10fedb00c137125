import { describe, expect, it } from 'vitest'
import { suggestMapping } from '@/components/catalogue/progressionMapping'

// Each case is a worked example (by hand): old steps A, B, C, D; `origins` lists, for each new
// step in order, which old step it came from (null for a new step); the answer gives, for each
// old step, the new step its athletes continue from.

describe('suggestMapping', () => {
  it('keeps every step where it was when nothing changed', () => {
    // A B C D -> A B C D
    expect(suggestMapping(4, [0, 1, 2, 3])).toEqual([0, 1, 2, 3])
  })

  it('counts a new step in the places but sends no old step to it by itself', () => {
    // A B C -> A (new) C: B was removed, so its athletes go back to A (new step 0).
    expect(suggestMapping(3, [0, null, 2])).toEqual([0, 0, 2])
    // A B C -> A (new) B C: every old step moves one place on, past the new step.
    expect(suggestMapping(3, [0, null, 1, 2])).toEqual([0, 2, 3])
  })

  it('sends a removed step back to the kept step before it, never forward', () => {
    // A B C D -> A C D: B goes back to A (0); C and D are now steps 1 and 2.
    expect(suggestMapping(4, [0, 2, 3])).toEqual([0, 0, 1, 2])
    // A B C D -> A D: B and C both go back to A.
    expect(suggestMapping(4, [0, 3])).toEqual([0, 0, 0, 1])
  })

  it('sends a removed first step to the first new step', () => {
    // A B C -> B C: A has no kept step before it, so its athletes start at step 0 (B).
    expect(suggestMapping(3, [1, 2])).toEqual([0, 0, 1])
    // A B C -> (new) B C: A still goes to step 0, the new one.
    expect(suggestMapping(3, [null, 1, 2])).toEqual([0, 1, 2])
  })

  it('never puts athletes past a step they had not passed when steps are reordered', () => {
    // A B C D -> A C B D: athletes on B had not passed C, now before B: back to A (0). Athletes
    // on C had passed A, B and C: they continue from B (2), the last of those in the new order.
    expect(suggestMapping(4, [0, 2, 1, 3])).toEqual([0, 0, 2, 3])
    // A B C -> C A B: athletes on A or B had not passed C, now first: the first step is the
    // lowest there is. Athletes on C had passed all three: the last step (2).
    expect(suggestMapping(3, [2, 0, 1])).toEqual([0, 0, 2])
    // A B C D -> B A C D: athletes on A had not passed B, now first; those on B had passed both.
    expect(suggestMapping(4, [1, 0, 2, 3])).toEqual([0, 1, 2, 3])
  })

  it('follows a reorder and a removal together', () => {
    // A B C D -> C A D: B was removed. Athletes on A, B or C had not passed D; C is now first,
    // so athletes on A or B get the first step, those on C had passed C and A (1), those on D
    // everything (2).
    expect(suggestMapping(4, [2, 0, 3])).toEqual([0, 0, 1, 2])
  })

  it('proposes nothing for a progression that had no steps', () => {
    expect(suggestMapping(0, [null, null])).toEqual([])
  })
})
