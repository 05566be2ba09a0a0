// Series colours of Spinwright's charts: teal and copper in turn, from the theme's primary and
// accent, so charts follow the light and dark themes.

const LIGHT_EXTRA = ['#4f9e98', '#8f4d22', '#2f4f4d', '#e0a474', '#7fbcb5', '#6b3a1c']
const DARK_EXTRA = ['#2f8d87', '#f2c094', '#a7dcd6', '#b9683a', '#d7efe9', '#8a5330']

export function seriesPalette(primary: string, accent: string, dark: boolean): string[] {
  return [primary, accent, ...(dark ? DARK_EXTRA : LIGHT_EXTRA)]
}

export function colorAt(palette: readonly string[], index: number): string {
  return palette[index % palette.length] ?? '#0b5d5e'
}

/** rgba() of a #rrggbb colour; other colour strings are returned as they are. */
export function withAlpha(color: string, alpha: number): string {
  const match = /^#([0-9a-f]{2})([0-9a-f]{2})([0-9a-f]{2})$/i.exec(color)
  if (!match) return color
  const [r, g, b] = [match[1], match[2], match[3]].map((hex) => parseInt(hex ?? '0', 16))
  return `rgba(${r}, ${g}, ${b}, ${alpha})`
}
