import { fileURLToPath, URL } from 'node:url'
import vue from '@vitejs/plugin-vue'
import { defineConfig } from 'vite'

export default defineConfig({
  plugins: [vue()],
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
    chunkSizeWarningLimit: 1500,
  },
})
