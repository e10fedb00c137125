import { mount } from '@vue/test-utils'
import { NConfigProvider, NDialogProvider, NMessageProvider } from 'naive-ui'
import { createPinia, setActivePinia, type Pinia } from 'pinia'
import { defineComponent, h, type Component } from 'vue'
import type { Router } from 'vue-router'

/**
 * Mounts a component as the app shell holds it: inside the Naive UI providers (config,
 * messages, dialogs), with Pinia and the given router, attached to the document so that
 * dialogs and focus behave as in a browser.
 */
export function mountWithProviders(
  component: Component,
  props: Record<string, unknown>,
  options: { router: Router; pinia?: Pinia },
) {
  const pinia = options.pinia ?? createPinia()
  setActivePinia(pinia)
  const shell = defineComponent({
    setup: () => () =>
      h(NConfigProvider, null, () =>
        h(NMessageProvider, null, () => h(NDialogProvider, null, () => h(component, props))),
      ),
  })
  const wrapper = mount(shell, {
    attachTo: document.body,
    global: { plugins: [pinia, options.router], stubs: { teleport: true } },
  })
  return { wrapper, pinia, router: options.router }
}
