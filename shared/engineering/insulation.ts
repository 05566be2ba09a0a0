/**
 * Thermal classes of electrical insulation, IEC 60085: the class number is the temperature in degC
 * the insulation system is rated for continuously, with the traditional letters.
 */
export interface InsulationClass {
  letter: string
  /** Thermal class, degC. */
  classC: number
}

export const INSULATION_CLASSES: readonly InsulationClass[] = [
  { letter: 'Y', classC: 90 },
  { letter: 'A', classC: 105 },
  { letter: 'E', classC: 120 },
  { letter: 'B', classC: 130 },
  { letter: 'F', classC: 155 },
  { letter: 'H', classC: 180 },
  { letter: 'N', classC: 200 },
  { letter: 'R', classC: 220 },
]

/** Look a class up by letter ('F') or number (155); undefined if not an IEC 60085 class. */
export function insulationClass(key: string | number): InsulationClass | undefined {
  return INSULATION_CLASSES.find((c) => (typeof key === 'number' ? c.classC === key : c.letter === key.toUpperCase()))
}

/**
 * Margin in kelvin between a winding temperature and the class limit (negative: over the limit).
 * The resistance method gives an average winding temperature; the hottest spot runs higher, so
 * keep a hot-spot allowance (IEC 60034-1 builds one into its permitted rises).
 */
export function insulationMarginK(windingC: number, cls: InsulationClass, hotSpotAllowanceK = 0): number {
  return cls.classC - (windingC + hotSpotAllowanceK)
}
