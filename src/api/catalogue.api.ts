import type { Page } from '@shared/contracts/admin.contract'
import type { CatalogueFacets, DemoFan, VariantDetail, VariantListQuery, VariantRow } from '@shared/contracts/catalogue.contract'
import { http } from './http'

/** Query as the URL carries it: lists joined with commas, undefined dropped. */
export type VariantListParams = Partial<{ [K in keyof VariantListQuery]: VariantListQuery[K] }>

function toParams(query: VariantListParams): Record<string, string> {
  const params: Record<string, string> = {}
  for (const [key, value] of Object.entries(query)) {
    if (value === undefined || value === null || value === '') continue
    if (Array.isArray(value)) {
      if (value.length > 0) params[key] = value.join(',')
    } else params[key] = String(value)
  }
  return params
}

export async function listVariants(query: VariantListParams): Promise<Page<VariantRow>> {
  return (await http.get<Page<VariantRow>>('/v1/catalogue/variants', { params: toParams(query) })).data
}

export async function getVariant(partNumber: string): Promise<VariantDetail> {
  return (await http.get<VariantDetail>(`/v1/catalogue/variants/${encodeURIComponent(partNumber)}`)).data
}

export async function getFacets(): Promise<CatalogueFacets> {
  return (await http.get<CatalogueFacets>('/v1/catalogue/facets')).data
}

export async function listDemoFans(): Promise<DemoFan[]> {
  return (await http.get<DemoFan[]>('/v1/catalogue/demo-fans')).data
}

export function datasheetUrl(partNumber: string, datasheetId: string): string {
  return `/api/v1/catalogue/variants/${encodeURIComponent(partNumber)}/datasheets/${encodeURIComponent(datasheetId)}`
}
