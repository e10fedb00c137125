import type { Pinia } from 'pinia'
import type { Component } from 'vue'
import { mountWithProviders } from './mount'
import { createMemoryHistory, createRouter, type Router } from 'vue-router'
import { deriveElement, findCounterparts } from '@shared/domain/catalogue'
import type { CatalogueElement, ElementInput } from '@shared/schemas/elements'

const blank: Component = { render: () => null }

/** A router holding the catalogue's route names, so that RouterLinks resolve to real paths. */
export function catalogueRouter(): Router {
  return createRouter({
    history: createMemoryHistory(),
    routes: [
      { path: '/', name: 'home', component: blank },
      { path: '/catalogue', name: 'catalogue', component: blank },
      { path: '/catalogue/templates', name: 'catalogue-templates', component: blank },
      { path: '/catalogue/new', name: 'element-new', component: blank },
      { path: '/catalogue/:id/edit', name: 'element-edit', component: blank },
      { path: '/catalogue/:id', name: 'element', component: blank },
    ],
  })
}

/** Mounts a component inside the Naive UI providers, with Pinia and the catalogue's routes. */
export function mountInProviders(
  component: Component,
  props: Record<string, unknown> = {},
  options: { pinia?: Pinia; router?: Router } = {},
) {
  return mountWithProviders(component, props, {
    router: options.router ?? catalogueRouter(),
    pinia: options.pinia,
  })
}

let serial = 0

/** A catalogue element as the API answers it, with its derived fields computed. */
export function catalogueElement(
  input: Partial<ElementInput> & { name: string },
): CatalogueElement {
  const full: ElementInput = {
    apparatus: 'trampoline',
    direction: 'backward',
    quarterRotations: 4,
    twists: [0],
    shape: 'tuck',
    takeOff: 'trampoline-bounce',
    difficultyLetter: null,
    notes: null,
    ...input,
  }
  const derived = deriveElement(full)
  serial += 1
  return {
    ...full,
    id: `00000000-0000-4000-8000-${String(serial).padStart(12, '0')}`,
    clubId: '11111111-1111-4111-8111-111111111111',
    saltoCount: derived.saltoCount,
    totalHalfTwists: derived.totalHalfTwists,
    rotationClass: derived.rotationClass,
    twistBand: derived.twistBand,
    notation: derived.notation,
    trampolineDifficulty: derived.trampolineDifficulty,
    difficultyValue: derived.difficultyValue,
    counterpartKey: derived.counterpartKey,
    counterpartId: null,
  }
}

/** Links each element to its counterpart in the list, as the server does. */
export function linked(elements: CatalogueElement[]): CatalogueElement[] {
  const counterparts = findCounterparts(elements)
  return elements.map((e) => ({ ...e, counterpartId: counterparts.get(e.id) ?? null }))
}
