import { computed, nextTick, onBeforeUnmount, onMounted, ref, type Ref } from 'vue'

// True while the page is being printed, so that paginated tables lay out every row: a printed
// report that stopped at the first page of the gap list would mislead. One flag for the page.
// Browsers announce printing in two ways, and neither alone covers them all: the print events
// (Ctrl+P, the Print button, Chromium's PDF output) and the print media query (browsers that
// switch media for the preview, and print emulation, where no print event fires).
const printEvent = ref(false)
const printMedia = ref(false)
const printing = computed(() => printEvent.value || printMedia.value)

const before = () => (printEvent.value = true)
const after = () => (printEvent.value = false)
const mediaChanged = (event: { matches: boolean }) => (printMedia.value = event.matches)

// Several components on a page share the flag: the listeners stay until the last one leaves.
let users = 0
let printQuery: MediaQueryList | null = null

function listen() {
  if (users++ > 0) return
  window.addEventListener('beforeprint', before)
  window.addEventListener('afterprint', after)
  printQuery = typeof window.matchMedia === 'function' ? window.matchMedia('print') : null
  if (printQuery) {
    printMedia.value = printQuery.matches
    printQuery.addEventListener('change', mediaChanged)
  }
}

function stopListening() {
  if (--users > 0) return
  window.removeEventListener('beforeprint', before)
  window.removeEventListener('afterprint', after)
  printQuery?.removeEventListener('change', mediaChanged)
  printQuery = null
  printEvent.value = false
  printMedia.value = false
}

/** The page's printing flag, listening to print events and the print media query while mounted. */
export function usePrinting(): Readonly<Ref<boolean>> {
  onMounted(listen)
  onBeforeUnmount(stopListening)
  return printing
}

/**
 * Opens the print dialog once the tables have re-rendered with all their rows. `window.print()`
 * blocks, and Vue's update would only run after it returns, hence the flag is set first.
 */
export async function printPage() {
  printEvent.value = true
  await nextTick()
  try {
    window.print()
  } finally {
    printEvent.value = false
  }
}
