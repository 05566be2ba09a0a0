// Focuses a field's input as it is mounted, unless the person is already in another field.
// Vuetify's `autofocus` focuses 50 ms after the field scrolls into view: typing faster than that
// (a password manager, a quick typist, a test) sent the rest of the keystrokes into the first field.
import type { Directive } from 'vue'

export const vFocusOnMount: Directive<HTMLElement> = {
  mounted(el) {
    const active = document.activeElement
    if (active && active !== document.body && active !== el) return
    const input = el.matches('input,textarea') ? el : el.querySelector<HTMLElement>('input,textarea')
    input?.focus()
  },
}
