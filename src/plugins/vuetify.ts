import '@mdi/font/css/materialdesignicons.css'
import '@fontsource/roboto/400.css'
import '@fontsource/roboto/500.css'
import '@fontsource/roboto/700.css'
import 'vuetify/styles'
import { createVuetify, type ThemeDefinition } from 'vuetify'

// Spinwright's palette: deep teal for structure, copper for the one thing to act on.
const light: ThemeDefinition = {
  dark: false,
  colors: {
    background: '#f6f8f7',
    surface: '#ffffff',
    'surface-variant': '#e3ebea',
    primary: '#0b5d5e',
    'primary-darken-1': '#084647',
    secondary: '#3f6f6a',
    accent: '#c8753a',
    error: '#b3261e',
    warning: '#a86400',
    info: '#1f6f8b',
    success: '#2e7d4f',
  },
}

const dark: ThemeDefinition = {
  dark: true,
  colors: {
    background: '#0f1716',
    surface: '#16211f',
    'surface-variant': '#22302e',
    primary: '#5fb8b3',
    'primary-darken-1': '#3f9993',
    secondary: '#8fbdb6',
    accent: '#e39a62',
    error: '#f2b8b5',
    warning: '#f0b35a',
    info: '#7cc3dd',
    success: '#7fcf9c',
  },
}

export const vuetify = createVuetify({
  theme: { defaultTheme: 'light', themes: { light, dark } },
  defaults: {
    VTextField: { variant: 'outlined', density: 'comfortable' },
    VSelect: { variant: 'outlined', density: 'comfortable' },
    VAutocomplete: { variant: 'outlined', density: 'comfortable' },
    VTextarea: { variant: 'outlined' },
    VBtn: { rounded: 'lg' },
    VCard: { rounded: 'lg' },
  },
})
