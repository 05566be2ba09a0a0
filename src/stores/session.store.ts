import { computed, ref } from 'vue'
import { defineStore } from 'pinia'
import type { Role, SessionUser, SignInBody, UnitSystem } from '@shared/contracts/auth.contract'
import * as authApi from '@/api/auth.api'

export const useSessionStore = defineStore('session', () => {
  const user = ref<SessionUser | null>(null)
  const loaded = ref(false)

  const signedIn = computed(() => user.value !== null)
  const role = computed<Role | null>(() => user.value?.role ?? null)
  const units = computed<UnitSystem>(() => user.value?.units ?? 'si')
  const isStaff = computed(() => role.value === 'admin' || role.value === 'sales')

  async function load(force = false): Promise<void> {
    if (loaded.value && !force) return
    user.value = await authApi.fetchSessionUser()
    loaded.value = true
  }

  async function signIn(body: SignInBody): Promise<SessionUser> {
    user.value = await authApi.signIn(body)
    loaded.value = true
    return user.value
  }

  async function signOut(): Promise<void> {
    await authApi.signOut()
    user.value = null
  }

  async function setUnits(next: UnitSystem): Promise<void> {
    if (!user.value) return
    user.value = await authApi.savePreferences(next)
  }

  /** Called when the API says the session is gone. */
  function forget(): void {
    user.value = null
  }

  return { user, loaded, signedIn, role, units, isStaff, load, signIn, signOut, setUnits, forget }
})
