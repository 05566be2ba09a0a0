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

/** rgba() of a #rgb, #rrggbb or #rrggbbaa colour; other colour strings are returned as they are. */
export function withAlpha(color: string, alpha: number): string {
  let hex = /^#([0-9a-f]{3,8})$/i.exec(color)?.[1]
  if (!hex || ![3, 6, 8].includes(hex.length)) return color
  if (hex.length === 3) hex = [...hex].map((ch) => ch + ch).join('')
  const [r, g, b] = [0, 2, 4].map((at) => parseInt(hex.slice(at, at + 2), 16))
  return `rgba(${r}, ${g}, ${b}, ${alpha})`
}
