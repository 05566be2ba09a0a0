// The small torque-speed chart of a quote line, drawn with pdfkit vector paths: motor torque at
// nominal (solid teal) and low line (dashed teal) against the fan's load torque (copper), with
// both operating points marked and labelled with their speed.
import type { LineDutyPoint } from '../../shared/contracts/quote.contract'
import { COLOURS, FONT, line, type Pdf } from './pdf-kit'

type CurvePoint = { rpm: number; torqueNm: number }

export interface Box {
  x: number
  y: number
  w: number
  h: number
}

/** A "nice" axis: ticks at 1, 2, 2.5 or 5 x 10^k from zero up to at least `max`. */
export function niceAxis(max: number, targetTicks = 5): { max: number; step: number; ticks: number[]; decimals: number } {
  const safeMax = Number.isFinite(max) && max > 0 ? max : 1
  const raw = safeMax / targetTicks
  const magnitude = 10 ** Math.floor(Math.log10(raw))
  const step = ([1, 2, 2.5, 5, 10].map((m) => m * magnitude).find((s) => s >= raw) ?? 10 * magnitude)
  const count = Math.ceil(safeMax / step - 1e-9)
  const ticks = Array.from({ length: count + 1 }, (_, i) => i * step)
  const decimals = Math.max(0, -Math.floor(Math.log10(step) + 1e-9) + (step / magnitude === 2.5 ? 1 : 0))
  return { max: count * step, step, ticks, decimals }
}

/** Linear interpolation on a curve sorted by rpm; clamps at the ends; null for an empty curve. */
export function torqueAt(curve: readonly CurvePoint[], rpm: number): number | null {
  const first = curve[0]
  if (first === undefined) return null
  if (rpm <= first.rpm) return first.torqueNm
  for (let i = 1; i < curve.length; i++) {
    const a = curve[i - 1]
    const b = curve[i]
    if (a === undefined || b === undefined) continue
    if (rpm <= b.rpm) {
      const t = b.rpm === a.rpm ? 0 : (rpm - a.rpm) / (b.rpm - a.rpm)
      return a.torqueNm + t * (b.torqueNm - a.torqueNm)
    }
  }
  return curve[curve.length - 1]?.torqueNm ?? null
}

const PLOT_INSET = { left: 34, right: 8, top: 14, bottom: 40 }
const integer = new Intl.NumberFormat('en-US', { maximumFractionDigits: 0 })
export const rpmText = (rpm: number): string => `${integer.format(Math.round(rpm))} r/min`

export function drawTorqueChart(doc: Pdf, box: Box, dp: LineDutyPoint): void {
  const curves = [dp.motorCurve, dp.motorLowLineCurve, dp.loadCurve]
  const all = curves.flat()
  const xAxis = niceAxis(Math.max(...all.map((p) => p.rpm), dp.nominal.rpm, 1), 4)
  const yAxis = niceAxis(Math.max(...all.map((p) => p.torqueNm), 1e-6), 4)
  const plot = {
    x: box.x + PLOT_INSET.left,
    y: box.y + PLOT_INSET.top,
    w: box.w - PLOT_INSET.left - PLOT_INSET.right,
    h: box.h - PLOT_INSET.top - PLOT_INSET.bottom,
  }
  const px = (rpm: number): number => plot.x + (rpm / xAxis.max) * plot.w
  const py = (torque: number): number => plot.y + plot.h - (torque / yAxis.max) * plot.h

  // Grid, axes, ticks.
  doc.save().lineWidth(0.4).strokeColor(COLOURS.grid)
  for (const t of yAxis.ticks.slice(1)) doc.moveTo(plot.x, py(t)).lineTo(plot.x + plot.w, py(t)).stroke()
  for (const t of xAxis.ticks.slice(1)) doc.moveTo(px(t), plot.y).lineTo(px(t), plot.y + plot.h).stroke()
  doc.restore()
  doc.save().lineWidth(0.7).strokeColor(COLOURS.muted)
  doc.moveTo(plot.x, plot.y).lineTo(plot.x, plot.y + plot.h).lineTo(plot.x + plot.w, plot.y + plot.h).stroke()
  for (const t of yAxis.ticks) doc.moveTo(plot.x - 3, py(t)).lineTo(plot.x, py(t)).stroke()
  for (const t of xAxis.ticks) doc.moveTo(px(t), plot.y + plot.h).lineTo(px(t), plot.y + plot.h + 3).stroke()
  doc.restore()
  const tickStyle = { size: 6.5, color: COLOURS.muted }
  for (const t of yAxis.ticks) line(doc, t.toFixed(yAxis.decimals), plot.x - 30, py(t) - 3, { ...tickStyle, align: 'right', width: 26 })
  for (const t of xAxis.ticks) line(doc, integer.format(Math.round(t)), px(t) - 20, plot.y + plot.h + 5, { ...tickStyle, align: 'center', width: 40 })
  line(doc, 'Torque (N m)', box.x, box.y, { size: 7, color: COLOURS.muted })
  line(doc, 'Speed (r/min)', plot.x, plot.y + plot.h + 14, { size: 7, color: COLOURS.muted, align: 'center', width: plot.w })

  // Curves, clipped to the plot area.
  doc.save()
  doc.rect(plot.x, plot.y, plot.w, plot.h).clip()
  polyline(doc, dp.loadCurve, px, py, { color: COLOURS.copper, width: 1.3 })
  polyline(doc, dp.motorLowLineCurve, px, py, { color: COLOURS.teal, width: 1.1, dash: true })
  polyline(doc, dp.motorCurve, px, py, { color: COLOURS.teal, width: 1.4 })
  doc.restore()

  // Operating points: on the load curve at the solved speed (the two curves meet there).
  const nominalT = torqueAt(dp.loadCurve, dp.nominal.rpm) ?? torqueAt(dp.motorCurve, dp.nominal.rpm) ?? 0
  const lowT = torqueAt(dp.loadCurve, dp.lowLine.rpm) ?? torqueAt(dp.motorLowLineCurve, dp.lowLine.rpm) ?? 0
  const nominalPt = { x: px(dp.nominal.rpm), y: py(nominalT) }
  const lowPt = { x: px(dp.lowLine.rpm), y: py(lowT) }
  doc.save().circle(lowPt.x, lowPt.y, 2.6).lineWidth(1).fillAndStroke(COLOURS.white, COLOURS.teal).restore()
  doc.save().circle(nominalPt.x, nominalPt.y, 2.6).fill(COLOURS.teal).restore()
  // Nominal label above the point, low-line label below it, both ending left of the point (the
  // points sit near the right of the plot, close to synchronous speed).
  pointLabel(doc, rpmText(dp.nominal.rpm), nominalPt.x - 5, Math.max(plot.y, Math.min(nominalPt.y, lowPt.y) - 13), plot.x + 2)
  pointLabel(doc, rpmText(dp.lowLine.rpm), lowPt.x - 5, Math.min(plot.y + plot.h - 10, Math.max(nominalPt.y, lowPt.y) + 5), plot.x + 2)

  // Legend under the axis label.
  const ly = box.y + box.h - 9
  let lx = box.x + 4
  lx = legendItem(doc, lx, ly, `${dp.supply.volts} V`, { color: COLOURS.teal, width: 1.4 })
  lx = legendItem(doc, lx, ly, `low line ${dp.lowLine.volts} V`, { color: COLOURS.teal, width: 1.1, dash: true })
  legendItem(doc, lx, ly, 'fan load', { color: COLOURS.copper, width: 1.3 })
}

interface Stroke {
  color: string
  width: number
  dash?: boolean
}

function polyline(doc: Pdf, points: readonly CurvePoint[], px: (r: number) => number, py: (t: number) => number, s: Stroke): void {
  const first = points[0]
  if (first === undefined) return
  doc.save().lineWidth(s.width).strokeColor(s.color).lineJoin('round')
  if (s.dash) doc.dash(3, { space: 2 })
  doc.moveTo(px(first.rpm), py(first.torqueNm))
  for (const p of points.slice(1)) doc.lineTo(px(p.rpm), py(p.torqueNm))
  doc.stroke()
  doc.restore()
}

function pointLabel(doc: Pdf, text: string, rightX: number, y: number, minX: number): void {
  doc.font(FONT.bold).fontSize(6.5)
  const w = doc.widthOfString(text)
  // A point near zero speed (a motor that does not start) gets its label on its right instead.
  if (rightX - w < minX) rightX = rightX + w + 10
  doc.save().rect(rightX - w - 2, y - 1, w + 4, 9).fillOpacity(0.85).fill(COLOURS.white).restore()
  line(doc, text, rightX - w, y, { font: FONT.bold, size: 6.5, color: COLOURS.teal })
}

function legendItem(doc: Pdf, x: number, y: number, label: string, s: Stroke): number {
  doc.save().lineWidth(s.width).strokeColor(s.color)
  if (s.dash) doc.dash(3, { space: 2 })
  doc.moveTo(x, y + 3.5).lineTo(x + 14, y + 3.5).stroke()
  doc.restore()
  const w = line(doc, label, x + 17, y, { size: 6.5, color: COLOURS.muted })
  return x + 17 + w + 10
}
