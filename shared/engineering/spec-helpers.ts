/** Helpers shared by the specs of this folder (not part of the public API). */
import { EngineeringInputError } from './errors'

/** The `field` of the EngineeringInputError that `fn` throws; fails loudly if it throws nothing else. */
export function errorField(fn: () => unknown): string {
  try {
    fn()
  } catch (err) {
    if (err instanceof EngineeringInputError) return err.field
    throw err
  }
  throw new Error('expected an EngineeringInputError, but nothing was thrown')
}
