import { deleteDB } from 'idb'

// What the tablet keeps for offline use, in one place so that sign-out can clear all of it.

/** The service worker's copy of the API answers the offline screens need (vite.config.ts). */
export const apiCacheName = 'twofold-api'
/** Entries made offline and waiting to be sent (src/offline/outbox-db.ts). */
export const outboxDbName = 'twofold-outbox'

/** Registers the service worker of the production build, which keeps the app shell offline. */
export function registerServiceWorker() {
  if (!import.meta.env.PROD || !('serviceWorker' in navigator)) return
  navigator.serviceWorker.register('/sw.js', { scope: '/' }).catch(() => {
    // Without a service worker the app works as before, online only.
  })
}

/**
 * Deletes the kept API answers (squad lists, records), as when a session ends however it ends.
 * Entries still waiting stay, for their maker to send once signed in again.
 */
export async function forgetApiAnswers() {
  if (typeof caches !== 'undefined') await caches.delete(apiCacheName)
}

/** Deletes the kept API answers and the waiting entries: nothing about athletes stays behind. */
export async function clearOfflineData() {
  await forgetApiAnswers()
  if (typeof indexedDB !== 'undefined') await deleteDB(outboxDbName)
}
