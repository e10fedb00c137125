import { nextTick, onBeforeUnmount, onMounted, readonly, ref } from 'vue'

// True while the page is being printed, so that paginated tables lay out every row: a printed
// report that stopped at the first page of the gap list would mislead. One flag for the page,
// set by the browser's print events (Ctrl+P) and by the Print button alike.
const printing = ref(false)
const before = () => (printing.value = true)
const after = () => (printing.value = false)

/** The page's printing flag, listening to the browser's print events while mounted. */
export function usePrinting() {
  onMounted(() => {
    window.addEventListener('beforeprint', before)
    window.addEventListener('afterprint', after)
  })
  onBeforeUnmount(() => {
    window.removeEventListener('beforeprint', before)
    window.removeEventListener('afterprint', after)
  })
  return readonly(printing)
}

/**
 * Opens the print dialog once the tables have re-rendered with all their rows. `window.print()`
 * blocks, and Vue's update would only run after it returns, hence the flag is set first.
 */
export async function printPage() {
  printing.value = true
  await nextTick()
  try {
    window.print()
  } finally {
    printing.value = false
  }
}
