/**
 * The token of an e-mailed link. Links carry it after `#`, so that it never reaches a server
 * log; it is taken off the address bar once read.
 */
export function useLinkToken(): string | null {
  const params = new URLSearchParams(window.location.hash.replace(/^#/, ''))
  const token = params.get('token')
  if (token) history.replaceState(history.state, '', window.location.pathname)
  return token
}
