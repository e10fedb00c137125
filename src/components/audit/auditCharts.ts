import {
  BarElement,
  CategoryScale,
  Chart,
  Legend,
  LinearScale,
  LineElement,
  PointElement,
  Title,
  Tooltip,
  type Plugin,
} from 'chart.js'
import { onBeforeUnmount, onMounted } from 'vue'

// Only the pieces the audit's charts draw; vue-chartjs registers the bar and line controllers
// itself. Registering twice is harmless, so every chart component may import this module.
Chart.register(
  BarElement,
  CategoryScale,
  LinearScale,
  LineElement,
  PointElement,
  Title,
  Tooltip,
  Legend,
)

/** The brand's direction colours (the same as `--tf-forward` and `--tf-backward` in base.css). */
export const chartColours = {
  forward: '#2f7d6d',
  backward: '#b5622d',
  lag: '#1d4e5f',
  ratio: '#2f7d6d',
  grid: '#d9e0de',
  ink: '#1c2a30',
}

/**
 * A colour with white diagonal stripes, so that the backward bars differ from the forward ones
 * by pattern as well as by colour (for colour-blind readers and grey-scale prints). Without a
 * 2D canvas (tests) the plain colour is used.
 */
export function hatched(colour: string): string | CanvasPattern {
  if (typeof document === 'undefined') return colour
  const tile = document.createElement('canvas')
  tile.width = 8
  tile.height = 8
  const ctx = tile.getContext?.('2d')
  if (!ctx) return colour
  ctx.fillStyle = colour
  ctx.fillRect(0, 0, 8, 8)
  ctx.strokeStyle = 'rgba(255, 255, 255, 0.7)'
  ctx.lineWidth = 2
  ctx.beginPath()
  ctx.moveTo(0, 8)
  ctx.lineTo(8, 0)
  ctx.moveTo(-2, 2)
  ctx.lineTo(2, -2)
  ctx.moveTo(6, 10)
  ctx.lineTo(10, 6)
  ctx.stroke()
  return ctx.createPattern(tile, 'repeat') ?? colour
}

/**
 * Paints a white background under the chart: a PNG saved from the canvas is otherwise
 * transparent and shows black in some image viewers and slides.
 */
export const whiteBackground: Plugin = {
  id: 'tfWhiteBackground',
  beforeDraw(chart) {
    const { ctx } = chart
    ctx.save()
    ctx.globalCompositeOperation = 'destination-over'
    ctx.fillStyle = '#ffffff'
    ctx.fillRect(0, 0, chart.width, chart.height)
    ctx.restore()
  },
}

// The width of a printed page's content in CSS pixels: A4 less the report's 14 mm margins
// (Letter is a little wider). The print stylesheet scales a chart down if the paper is narrower.
const printWidth = 680

/**
 * Redraws every chart at the printed page's width before printing and at its box's size
 * afterwards. Chart.js draws for the screen, and the browser lays the page out for paper only
 * after `beforeprint`: a chart drawn 1200 pixels wide would be shrunk onto the page, its text
 * too small to read, so the width is given explicitly and the height kept.
 */
export function useChartsResizeForPrint() {
  const forPrint = () => {
    for (const chart of Object.values(Chart.instances)) {
      const height = chart.canvas.parentElement?.clientHeight || chart.height
      chart.resize(printWidth, height)
    }
  }
  const forScreen = () => {
    for (const chart of Object.values(Chart.instances)) chart.resize()
  }
  onMounted(() => {
    window.addEventListener('beforeprint', forPrint)
    window.addEventListener('afterprint', forScreen)
  })
  onBeforeUnmount(() => {
    window.removeEventListener('beforeprint', forPrint)
    window.removeEventListener('afterprint', forScreen)
  })
}
