// Props of the reusable charts. Values arrive in display units; the caller converts from SI.

/** One [x, y] pair. */
export type ChartPoint = readonly [number, number]

export interface ChartAxis {
  /** Quantity shown on the axis, e.g. "Speed". */
  name: string
  /** Unit appended to the axis name and the tooltip values, e.g. "r/min". */
  unit?: string
  min?: number
  max?: number
  /** Decimals in tooltips and ticks; default chosen from the value. */
  decimals?: number
}

/** A labelled point drawn on a line (an operating point, a breakdown point). */
export interface ChartMark {
  name: string
  at: ChartPoint
  /** Short text beside the mark; default the name. */
  label?: string
}

export type ChartSymbol = 'circle' | 'rect' | 'roundRect' | 'triangle' | 'diamond'

export interface LineSeries {
  name: string
  points: readonly ChartPoint[]
  /** A palette colour is used when left out. */
  color?: string
  dashed?: boolean
  /** Draw a symbol at every point (for sparse, measured data). */
  symbols?: boolean
  symbol?: ChartSymbol
  marks?: readonly ChartMark[]
  /** Thinner and lighter, for context curves (e.g. the low-line case). */
  muted?: boolean
}

export interface ScatterSeries {
  name: string
  points: readonly ChartPoint[]
  color?: string
  symbol?: ChartSymbol
  size?: number
  /** Text beside each point, same order as points. */
  labels?: readonly string[]
  /** Outline only, so the curve under the points stays visible (measured points on a fitted curve). */
  hollow?: boolean
}
