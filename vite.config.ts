import { fileURLToPath, URL } from 'node:url'
import { defineConfig } from 'vite'
import vue from '@vitejs/plugin-vue'
import vuetify from 'vite-plugin-vuetify'

const apiTarget = process.env.API_URL ?? `http://127.0.0.1:${process.env.API_PORT ?? 8081}`

export default defineConfig({
  plugins: [vue(), vuetify({ autoImport: true })],
  resolve: {
    alias: {
      '@': fileURLToPath(new URL('./src', import.meta.url)),
      '@shared': fileURLToPath(new URL('./shared', import.meta.url)),
    },
  },
  server: {
    host: '127.0.0.1',
    port: Number(process.env.PORT ?? 5173),
    proxy: { '/api': { target: apiTarget, changeOrigin: false } },
  },
  optimizeDeps: { include: ['vuetify/components/VMenu', 'vuetify/components/VDialog', 'vuetify/components/VOverlay'] },
  build: {
    chunkSizeWarningLimit: 900,
    rollupOptions: {
      output: {
        manualChunks(id: string) {
          if (id.includes('node_modules/echarts/') || id.includes('node_modules/zrender/')) return 'charts'
          return undefined
        },
      },
    },
  },
})
