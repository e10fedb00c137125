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

/**
 * Redraws every chart at the page's print size before printing and back afterwards: Chart.js
 * sizes its canvas for the screen, and a print preview would otherwise crop or stretch it.
 */
export function useChartsResizeForPrint() {
  const resizeAll = () => {
    for (const chart of Object.values(Chart.instances)) chart.resize()
  }
  onMounted(() => {
    window.addEventListener('beforeprint', resizeAll)
    window.addEventListener('afterprint', resizeAll)
  })
  onBeforeUnmount(() => {
    window.removeEventListener('beforeprint', resizeAll)
    window.removeEventListener('afterprint', resizeAll)
  })
}
