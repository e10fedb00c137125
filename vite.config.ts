import { fileURLToPath, URL } from 'node:url'
import vue from '@vitejs/plugin-vue'
import { defineConfig, type Plugin } from 'vite'
import { VitePWA } from 'vite-plugin-pwa'

// Naive UI leaves a few things unnamed that assistive technology needs named, in code no prop
// reaches: each rewrite below puts the missing attribute in. The build fails if a new Naive UI
// version no longer has the code a rewrite expects, so that it is looked at again.
const naiveRewrites: { file: RegExp; from: string; to: string }[] = [
  // The card marks its header and the title in it as headings without a level: the title passed
  // as `title` becomes a section heading (level 2); a header slot brings its own `<h2>`.
  {
    file: /naive-ui[\\/]es[\\/]card[\\/]src[\\/]Card\.mjs$/,
    from: `style: normalizeStyle(this.headerStyle),
          role: "heading"`,
    to: `style: normalizeStyle(this.headerStyle)`,
  },
  {
    file: /naive-ui[\\/]es[\\/]card[\\/]src[\\/]Card\.mjs$/,
    from: `-card-header__main\`),
          role: "heading"`,
    to: `-card-header__main\`),
          role: title ? "heading" : undefined,
          "aria-level": title ? 2 : undefined`,
  },
  // The number input's − and + buttons are icons alone.
  {
    file: /naive-ui[\\/]es[\\/]input-number[\\/]src[\\/]InputNumber\.mjs$/,
    from: `onClick: this.handleMinusClick,`,
    to: `onClick: this.handleMinusClick,
        "aria-label": "Decrease",`,
  },
  {
    file: /naive-ui[\\/]es[\\/]input-number[\\/]src[\\/]InputNumber\.mjs$/,
    from: `onClick: this.handleAddClick,`,
    to: `onClick: this.handleAddClick,
        "aria-label": "Increase",`,
  },
]

function naiveAria(): Plugin {
  return {
    name: 'twofold-naive-aria',
    enforce: 'pre',
    transform(code, id) {
      const rewrites = naiveRewrites.filter((r) => r.file.test(id))
      if (rewrites.length === 0) return null
      return rewrites.reduce((out, r) => {
        if (!out.includes(r.from))
          throw new Error(`${id} changed: review naiveRewrites (vite.config.ts)`)
        return out.replace(r.from, r.to)
      }, code)
    },
  }
}

/**
 * The API answers a tablet needs to log progress offline after a reload: who is signed in, the
 * squads, the roster, the catalogue, the squad grid, a record's detail (with the open
 * recommendations the grid marks) and the squad logging list (`batchList` below). Nothing else
 * from `/api` is kept; sign-out deletes the cache (`apiCacheName` in src/offline/caches.ts).
 */
const offlineApi = [
  /\/api\/auth\/me$/,
  /\/api\/clubs\/[^/]+\/squads(\/[^/?]+(\/grid)?)?(\?.*)?$/,
  /\/api\/clubs\/[^/]+\/elements(\?.*)?$/,
  /\/api\/clubs\/[^/]+\/athletes(\?.*)?$/,
  /\/api\/clubs\/[^/]+\/athletes\/[^/]+\/records\/[^/?]+$/,
  /\/api\/clubs\/[^/]+\/recommendations(\?.*)?$/,
]

/**
 * The squad logging list (GET …/squads/:squadId/progress-batch?elementId=…), kept under its URL
 * without the day asked (`occurredOn`): a list opened online yesterday still shows offline today,
 * and the checks of what is saved offline run on the server when it is sent.
 */
const batchList = /\/api\/clubs\/[^/]+\/squads\/[^/?]+\/progress-batch\?.*$/
const withoutDay = {
  // Written into the service worker as it stands: it must use nothing from outside.
  cacheKeyWillBeUsed: async ({ request }: { request: Request }) => {
    const url = new URL(request.url)
    url.searchParams.delete('occurredOn')
    return url.href
  },
}

const apiCaching = (urlPattern: RegExp, plugins: (typeof withoutDay)[] = []) => ({
  urlPattern,
  handler: 'NetworkFirst' as const,
  method: 'GET' as const,
  options: {
    cacheName: 'twofold-api',
    networkTimeoutSeconds: 5,
    cacheableResponse: { statuses: [200] },
    expiration: { maxEntries: 400, maxAgeSeconds: 7 * 24 * 3600 },
    plugins,
  },
})

/** The app installs as a web app; its service worker keeps the app shell for offline use. */
const pwa = VitePWA({
  injectRegister: null,
  registerType: 'autoUpdate',
  manifest: {
    name: 'Twofold',
    short_name: 'Twofold',
    description: 'Forward and backward progressions for gymnastics clubs',
    theme_color: '#1f4f4a',
    background_color: '#ffffff',
    display: 'standalone',
    start_url: '/',
    icons: [{ src: '/favicon.svg', sizes: 'any', type: 'image/svg+xml', purpose: 'any' }],
  },
  workbox: {
    globPatterns: ['**/*.{js,css,html,svg,woff2}'],
    navigateFallback: '/index.html',
    navigateFallbackDenylist: [/^\/api\//],
    cleanupOutdatedCaches: true,
    clientsClaim: true,
    skipWaiting: true,
    runtimeCaching: [
      ...offlineApi.map((urlPattern) => apiCaching(urlPattern)),
      apiCaching(batchList, [withoutDay]),
    ],
  },
})

export default defineConfig({
  plugins: [vue(), naiveAria(), pwa],
  resolve: {
    alias: {
      '@': fileURLToPath(new URL('./src', import.meta.url)),
      '@shared': fileURLToPath(new URL('./shared', import.meta.url)),
    },
  },
  server: {
    host: '127.0.0.1',
    port: Number(process.env.VITE_PORT ?? 5173),
    strictPort: true,
    proxy: {
      // changeOrigin stays false: Express sees the browser's Host, so its Origin check holds.
      '/api': {
        target: process.env.TWOFOLD_API_URL ?? 'http://127.0.0.1:3000',
        changeOrigin: false,
      },
    },
  },
  build: {
    // The app is served only by its own Express server: no inline scripts for the CSP to allow.
    modulePreload: { polyfill: false },
    // bench/bundle.bench.ts reads which files the sign-in page loads from the manifest.
    manifest: true,
    chunkSizeWarningLimit: 1500,
    rolldownOptions: {
      output: {
        codeSplitting: {
          groups: [
            { name: 'vue', test: /node_modules[\\/](@vue|vue|vue-router|pinia)[\\/]/ },
            {
              name: 'naive-base',
              test: /node_modules[\\/]naive-ui[\\/]es[\\/](config-provider|global-style|button|input|form|alert|card)[\\/]/,
            },
          ],
        },
      },
    },
  },
})
