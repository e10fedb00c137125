import { defineComponent, h, type PropType } from 'vue'

/**
 * A stand-in for vue-chartjs's charts, for `vi.mock('vue-chartjs')`: happy-dom has no 2D
 * canvas, and the charts are imported in `<script setup>`, where `global.stubs` does not reach
 * them. It prints the labels and dataset labels it is given, so a test can read what the chart
 * would show, and exposes a `chart` that saves as an image as Chart.js does.
 */
/** The title options each saved image was drawn with, oldest first. */
export const savedImageTitles: unknown[] = []

export const ChartStub = defineComponent({
  props: {
    data: {
      type: Object as PropType<{ labels?: unknown[]; datasets: { label?: string }[] }>,
      required: true,
    },
    options: { type: Object, default: () => ({}) },
    plugins: { type: Array, default: () => [] },
    ariaLabel: { type: String, default: '' },
  },
  setup(props, { expose }) {
    const chart = {
      options: { plugins: {} as { title?: unknown } },
      update: () => {},
      toBase64Image: () => {
        savedImageTitles.push(chart.options.plugins.title)
        return 'data:image/png;base64,AAAA'
      },
    }
    expose({ chart })
    return () =>
      h('div', { 'data-test': 'chart', 'aria-label': props.ariaLabel }, [
        h('span', { class: 'chart-labels' }, (props.data.labels ?? []).map(String).join(' | ')),
        h('span', { class: 'chart-datasets' }, props.data.datasets.map((d) => d.label).join(' | ')),
      ])
  },
})
