/**
 * Facts of the trade about the two motor types Spinwright sells, for notes and plausibility
 * warnings in the catalogue (common practice; no single published source).
 */

export type MotorType = 'shaded-pole' | 'psc'
export type Rotation = 'clockwise' | 'counterclockwise'

/**
 * A shaded-pole motor turns from the unshaded toward the shaded part of each pole, so it runs
 * toward the side that carries the shading ring; turning the stator over (end for end) reverses
 * it, as seen from the same shaft end. Common practice.
 *
 * @param shadedSide the side of each pole, going round as seen from the shaft end, that carries the ring
 * @param statorTurnedOver true if the stator is mounted the other way round
 */
export function shadedPoleRotation(shadedSide: Rotation, statorTurnedOver = false): Rotation {
  if (!statorTurnedOver) return shadedSide
  return shadedSide === 'clockwise' ? 'counterclockwise' : 'clockwise'
}

/**
 * Typical full-load efficiency of small single-phase fan motors (common practice, ranges from
 * memory): shaded-pole motors are low in torque and efficiency and common in small fans; PSC
 * motors do markedly better.
 */
export const TYPICAL_EFFICIENCY: Readonly<Record<MotorType, { min: number; max: number }>> = {
  'shaded-pole': { min: 0.05, max: 0.35 },
  psc: { min: 0.3, max: 0.75 },
}

/** Warnings for a claimed efficiency outside the typical range of its type (empty if plausible). */
export function efficiencyWarnings(type: MotorType, efficiency: number): string[] {
  const r = TYPICAL_EFFICIENCY[type]
  if (!Number.isFinite(efficiency)) return ['efficiency is not a number']
  if (efficiency > r.max) return [`${Math.round(efficiency * 100)} % is high for a ${type} motor (typical ${r.min * 100}-${r.max * 100} %)`]
  if (efficiency < r.min) return [`${Math.round(efficiency * 100)} % is low for a ${type} motor (typical ${r.min * 100}-${r.max * 100} %)`]
  return []
}
