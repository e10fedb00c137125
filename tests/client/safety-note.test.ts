import { mount } from '@vue/test-utils'
import { describe, expect, it } from 'vitest'
import { defineComponent, h, nextTick, ref } from 'vue'
import { safetyCaution } from '@shared/domain/element'
import CommonSafetyNote from '@/components/common/CommonSafetyNote.vue'

// The developers' guide: wherever the product suggests a step, the caution from the brief is
// shown, and once per screen (issue 14: "shows the safety caution once per screen").

describe('the safety caution', () => {
  it('shows once however many parts of a screen carry it, and comes back to the one left', async () => {
    const formOpen = ref(false)
    const screen = defineComponent({
      setup: () => () =>
        h('main', [
          h('section', { class: 'list' }, [h(CommonSafetyNote)]),
          formOpen.value ? h('form', [h(CommonSafetyNote)]) : null,
        ]),
    })
    const wrapper = mount(screen)
    const notes = () => wrapper.findAll('[data-test="safety-note"]')
    expect(notes()).toHaveLength(1)
    expect(notes()[0]!.text()).toContain(safetyCaution)

    // The form opens with its own: the caution moves beside the newest suggestion.
    formOpen.value = true
    await nextTick()
    expect(notes()).toHaveLength(1)
    expect(wrapper.find('form [data-test="safety-note"]').exists()).toBe(true)

    formOpen.value = false
    await nextTick()
    expect(notes()).toHaveLength(1)
    expect(wrapper.find('.list [data-test="safety-note"]').text()).toContain(safetyCaution)
    wrapper.unmount()
  })
})
