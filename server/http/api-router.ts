// Every API route is declared through this router with the roles it admits, so the role check runs
// on the server for each route and the full route table can be listed (tests walk it).
import { Router, type RequestHandler } from 'express'
import type { Role } from '../../shared/contracts/auth.contract'
import { ForbiddenError, UnauthorizedError } from './errors'

/** 'public': anyone; 'signed-in': any role; a list: only those roles. */
export type Access = 'public' | 'signed-in' | readonly Role[]

export interface RouteEntry {
  method: 'get' | 'post' | 'put' | 'patch' | 'delete'
  path: string
  access: Access
}

export function requireAccess(access: Access): RequestHandler {
  return (req, _res, next) => {
    if (access === 'public') return next()
    const user = req.user
    if (!user) throw new UnauthorizedError()
    if (access !== 'signed-in' && !access.includes(user.role)) throw new ForbiddenError()
    next()
  }
}

export class ApiRouter {
  readonly router = Router()
  readonly routes: RouteEntry[] = []

  constructor(readonly prefix = '') {}

  private add(method: RouteEntry['method'], path: string, access: Access, handlers: RequestHandler[]): void {
    this.routes.push({ method, path: `${this.prefix}${path}`, access })
    this.router[method](path, requireAccess(access), ...handlers)
  }

  get(path: string, access: Access, ...handlers: RequestHandler[]): void {
    this.add('get', path, access, handlers)
  }
  post(path: string, access: Access, ...handlers: RequestHandler[]): void {
    this.add('post', path, access, handlers)
  }
  put(path: string, access: Access, ...handlers: RequestHandler[]): void {
    this.add('put', path, access, handlers)
  }
  patch(path: string, access: Access, ...handlers: RequestHandler[]): void {
    this.add('patch', path, access, handlers)
  }
  delete(path: string, access: Access, ...handlers: RequestHandler[]): void {
    this.add('delete', path, access, handlers)
  }
}
