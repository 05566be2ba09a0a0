import type { DataSource } from 'typeorm'
import { userListQuerySchema, type AdminUserRow, type Page } from '../../shared/contracts/admin.contract'
import { User } from '../db/entities'
import { ApiRouter } from '../http/api-router'
import { parseOrThrow } from '../http/validate'

export function adminUserRoutes(dataSource: DataSource): ApiRouter {
  const api = new ApiRouter('/admin')

  api.get('/users', ['admin'], async (req, res) => {
    const query = parseOrThrow(userListQuerySchema, req.query, 'query')
    const builder = dataSource
      .getRepository(User)
      .createQueryBuilder('user')
      .innerJoinAndSelect('user.organisation', 'organisation')
      .orderBy('user.email', 'ASC')
      .skip((query.page - 1) * query.pageSize)
      .take(query.pageSize)
    if (query.role) builder.andWhere('user.role = :role', { role: query.role })
    if (query.search) builder.andWhere('(user.email LIKE :term OR user.name LIKE :term)', { term: `%${query.search.replace(/[\\%_]/g, '\\$&')}%` })
    const [rows, total] = await builder.getManyAndCount()
    const body: Page<AdminUserRow> = {
      items: rows.map((user) => ({
        id: user.id,
        email: user.email,
        name: user.name,
        role: user.role,
        organisation: user.organisation.name,
        disabled: user.disabledAt !== null,
        createdAt: user.createdAt.toISOString(),
      })),
      total,
      page: query.page,
      pageSize: query.pageSize,
    }
    res.json(body)
  })

  return api
}
