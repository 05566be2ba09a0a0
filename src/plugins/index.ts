import type { App } from 'vue'
import { createPinia } from 'pinia'
import { vuetify } from './vuetify'
import { router } from '@/router'

export function registerPlugins(app: App): void {
  app.use(createPinia())
  app.use(vuetify)
  app.use(router)
}
