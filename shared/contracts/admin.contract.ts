import { z } from 'zod'
import { roleSchema } from './auth.contract'

export const pageQuerySchema = z.object({
  page: z.coerce.number().int().min(1, { error: 'page starts at 1' }).default(1),
  pageSize: z.coerce.number().int().min(1).max(200, { error: 'at most 200 rows a page' }).default(25),
  search: z.string().trim().max(100).optional(),
})

export const userListQuerySchema = pageQuerySchema.extend({
  role: roleSchema.optional(),
})
export type UserListQuery = z.infer<typeof userListQuerySchema>

export interface AdminUserRow {
  id: string
  email: string
  name: string
  role: z.infer<typeof roleSchema>
  organisation: string
  disabled: boolean
  createdAt: string
}

export interface Page<T> {
  items: T[]
  total: number
  page: number
  pageSize: number
}
