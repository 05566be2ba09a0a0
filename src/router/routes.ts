import type { RouteRecordRaw } from 'vue-router'
import type { Role } from '@shared/contracts/auth.contract'

/** Every route name of the SPA; links and pushes accept only these. */
export type RouteName =
  | 'home'
  | 'sign-in'
  | 'set-password'
  | 'catalogue'
  | 'variant'
  | 'studies'
  | 'study'
  | 'study-new'
  | 'study-shared'
  | 'quotes'
  | 'quote'
  | 'admin'
  | 'forbidden'
  | 'not-found'

export type RouteAccess = 'public' | 'signed-in' | readonly Role[]

declare module 'vue-router' {
  interface RouteMeta {
    access: RouteAccess
    title: string
  }
}

type NamedRoute = RouteRecordRaw & { name: RouteName }

export const routes: NamedRoute[] = [
  { path: '/', name: 'home', component: () => import('@/views/HomeView.vue'), meta: { access: 'public', title: 'Home' } },
  { path: '/sign-in', name: 'sign-in', component: () => import('@/views/SignInView.vue'), meta: { access: 'public', title: 'Sign in' } },
  { path: '/set-password/:token', name: 'set-password', component: () => import('@/views/SetPasswordView.vue'), meta: { access: 'public', title: 'Choose your password' } },
  { path: '/catalogue', name: 'catalogue', component: () => import('@/views/CatalogueView.vue'), meta: { access: 'public', title: 'Catalogue' } },
  { path: '/catalogue/:partNumber', name: 'variant', component: () => import('@/views/VariantView.vue'), meta: { access: 'public', title: 'Motor' } },
  { path: '/studies', name: 'studies', component: () => import('@/views/StudiesView.vue'), meta: { access: 'signed-in', title: 'Duty studies' } },
  { path: '/studies/new', name: 'study-new', component: () => import('@/views/StudyView.vue'), meta: { access: 'public', title: 'New duty study' } },
  { path: '/studies/:id', name: 'study', component: () => import('@/views/StudyView.vue'), meta: { access: 'signed-in', title: 'Duty study' } },
  { path: '/shared/studies/:token', name: 'study-shared', component: () => import('@/views/StudyView.vue'), meta: { access: 'signed-in', title: 'Shared duty study' } },
  { path: '/quotes', name: 'quotes', component: () => import('@/views/QuotesView.vue'), meta: { access: 'signed-in', title: 'Quotes' } },
  { path: '/quotes/:id', name: 'quote', component: () => import('@/views/QuoteView.vue'), meta: { access: 'signed-in', title: 'Quote' } },
  { path: '/admin/:section?', name: 'admin', component: () => import('@/views/AdminView.vue'), meta: { access: ['admin'], title: 'Administration' } },
  { path: '/forbidden', name: 'forbidden', component: () => import('@/views/ForbiddenView.vue'), meta: { access: 'public', title: 'Not allowed' } },
  { path: '/:pathMatch(.*)*', name: 'not-found', component: () => import('@/views/NotFoundView.vue'), meta: { access: 'public', title: 'Not found' } },
]
