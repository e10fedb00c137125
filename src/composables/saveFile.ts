/**
 * Has the browser save `href` (a same-origin URL or a data URL) as a file, as a click on a
 * download link would, without a link on the page.
 */
export function saveFile(href: string, filename: string) {
  const link = document.createElement('a')
  link.href = href
  link.download = filename
  document.body.appendChild(link)
  link.click()
  link.remove()
}
