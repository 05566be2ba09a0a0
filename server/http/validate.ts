import type { z } from 'zod'
import { ValidationError } from './errors'

/** Maps zod issues to `{ "path.to.field": "reason" }`, the first reason per field. */
export function fieldsFromZod(error: z.ZodError, prefix?: string): Record<string, string> {
  const fields: Record<string, string> = {}
  for (const issue of error.issues) {
    const path = issue.path.map(String).join('.')
    const key = [prefix, path].filter(Boolean).join('.') || prefix || 'body'
    fields[key] ??= issue.message
  }
  return fields
}

export function parseOrThrow<S extends z.ZodType>(schema: S, value: unknown, prefix?: string): z.infer<S> {
  const result = schema.safeParse(value)
  if (!result.success) throw new ValidationError(fieldsFromZod(result.error, prefix))
  return result.data
}

