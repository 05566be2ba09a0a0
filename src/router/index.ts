import { createRouter, createWebHistory, type RouteLocationRaw } from 'vue-router'
import { setUnauthorizedHandler } from '@/api/http'
import { useSessionStore } from '@/stores/session.store'
import { routes, type RouteName } from './routes'

export const router = createRouter({ history: createWebHistory(), routes })

/** A typed location: only known route names compile. */
export function to(name: RouteName, extra: Omit<Exclude<RouteLocationRaw, string>, 'name'> = {}): RouteLocationRaw {
  return { ...extra, name }
}

router.beforeEach(async (target) => {
  const session = useSessionStore()
  await session.load().catch(() => undefined)
  const access = target.meta.access
  if (access === 'public') return true
  if (!session.user) return { name: 'sign-in', query: { next: target.fullPath } }
  if (access !== 'signed-in' && !access.includes(session.user.role)) return { name: 'forbidden', query: { from: target.fullPath } }
  return true
})

router.afterEach((target) => {
  document.title = `${target.meta.title} · Spinwright`
})

setUnauthorizedHandler(() => {
  const session = useSessionStore()
  session.forget()
  const current = router.currentRoute.value
  if (current.name !== 'sign-in') void router.push({ name: 'sign-in', query: { next: current.fullPath, expired: '1' } })
})
