// Screen state kept in the URL query, so a link reproduces the view and back/forward walk through
// it. The route is the single source of truth: `state` is read from it, `update` writes to it.
import { computed, type ComputedRef } from 'vue'
import { useRoute, useRouter, type LocationQuery, type LocationQueryRaw, type LocationQueryValue } from 'vue-router'

type RawValue = LocationQueryValue | LocationQueryValue[] | undefined

/** How one field travels through the query: `write` returns undefined to leave the key out. */
export interface QueryCodec<T> {
  read(raw: RawValue): T
  write(value: T): string | undefined
}

export type QueryCodecs<S> = { [K in keyof S]: QueryCodec<S[K]> }

function first(raw: RawValue): string | undefined {
  const value = Array.isArray(raw) ? raw[0] : raw
  return value === null || value === undefined ? undefined : value
}

function splitList(raw: RawValue): string[] {
  const values = Array.isArray(raw) ? raw : [raw]
  return values.flatMap((value) => (typeof value === 'string' ? value.split(',') : [])).map((part) => part.trim()).filter(Boolean)
}

function isOneOf<T extends string>(allowed: readonly T[], value: string): value is T {
  return allowed.some((item) => item === value)
}

/** Codecs for the usual kinds of field. Unknown or malformed values read as the default. */
export const queryCodec = {
  text(maxLength = 100): QueryCodec<string> {
    return {
      read: (raw) => (first(raw) ?? '').slice(0, maxLength),
      write: (value) => (value.trim() === '' ? undefined : value.trim()),
    }
  },
  int(fallback: number, min = Number.MIN_SAFE_INTEGER, max = Number.MAX_SAFE_INTEGER): QueryCodec<number> {
    return {
      read: (raw) => {
        const value = Number(first(raw))
        return Number.isInteger(value) && value >= min && value <= max ? value : fallback
      },
      write: (value) => (value === fallback ? undefined : String(value)),
    }
  },
  /** An optional number (a bound of a range): absent, empty or not a number reads as undefined. */
  number(min = -Infinity): QueryCodec<number | undefined> {
    return {
      read: (raw) => {
        const text = first(raw)
        if (text === undefined || text.trim() === '') return undefined
        const value = Number(text)
        return Number.isFinite(value) && value >= min ? value : undefined
      },
      write: (value) => (value === undefined || !Number.isFinite(value) ? undefined : String(value)),
    }
  },
  oneOf<T extends string>(allowed: readonly T[], fallback: T): QueryCodec<T> {
    return {
      read: (raw) => {
        const value = first(raw)
        return value !== undefined && isOneOf(allowed, value) ? value : fallback
      },
      write: (value) => (value === fallback ? undefined : value),
    }
  },
  /** A comma-separated list of allowed values, deduplicated, in the order given; others are dropped. */
  list<T extends string>(allowed: readonly T[]): QueryCodec<T[]> {
    return {
      read: (raw) => {
        const out: T[] = []
        for (const part of splitList(raw)) if (isOneOf(allowed, part) && !out.includes(part)) out.push(part)
        return out
      },
      write: (value) => (value.length === 0 ? undefined : value.join(',')),
    }
  },
  /** A comma-separated list of free values that match `pattern` (e.g. supplies "120-60"). */
  matching(pattern: RegExp): QueryCodec<string[]> {
    return {
      read: (raw) => [...new Set(splitList(raw).filter((part) => pattern.test(part)))],
      write: (value) => (value.length === 0 ? undefined : value.join(',')),
    }
  },
  intList(allowed?: readonly number[]): QueryCodec<number[]> {
    return {
      read: (raw) => {
        const out: number[] = []
        for (const part of splitList(raw)) {
          const value = Number(part)
          if (Number.isInteger(value) && (!allowed || allowed.includes(value)) && !out.includes(value)) out.push(value)
        }
        return out
      },
      write: (value) => (value.length === 0 ? undefined : value.join(',')),
    }
  },
}

/** The state a query describes. Keys without a codec are ignored. */
export function readQuery<S>(codecs: QueryCodecs<S>, query: LocationQuery): S {
  const out: Partial<S> = {}
  for (const key of Object.keys(codecs) as (keyof S & string)[]) {
    out[key] = codecs[key].read(query[key])
  }
  // Every key of S was filled from its codec just above.
  return out as S
}

/** A query for `state`, keeping the keys of `base` that no codec owns (another panel's, say). */
export function writeQuery<S>(codecs: QueryCodecs<S>, state: S, base: LocationQuery = {}): LocationQueryRaw {
  const out: LocationQueryRaw = {}
  for (const [key, value] of Object.entries(base)) if (!(key in codecs)) out[key] = value
  for (const key of Object.keys(codecs) as (keyof S & string)[]) {
    const text = codecs[key].write(state[key])
    if (text !== undefined) out[key] = text
  }
  return out
}

function sameQuery(a: LocationQueryRaw, b: LocationQueryRaw): boolean {
  const keys = new Set([...Object.keys(a), ...Object.keys(b)])
  for (const key of keys) if (JSON.stringify(a[key] ?? null) !== JSON.stringify(b[key] ?? null)) return false
  return true
}

export interface QuerySync<S> {
  /** The current state, read from the URL (reactive; follows back/forward). */
  state: ComputedRef<S>
  /** The query string of the current state only, stable for use as a reload key. */
  key: ComputedRef<string>
  /** Change some fields; a new history entry unless `replace`. No navigation when nothing changes. */
  update(patch: Partial<S>, options?: { replace?: boolean }): Promise<void>
  /** Every field (or the given ones) back to its default. */
  reset(keys?: readonly (keyof S)[], options?: { replace?: boolean }): Promise<void>
}

export function useQuerySync<S>(codecs: QueryCodecs<S>): QuerySync<S> {
  const route = useRoute()
  const router = useRouter()
  const defaults = readQuery(codecs, {})

  const state = computed(() => readQuery(codecs, route.query))
  const key = computed(() => {
    const query = writeQuery(codecs, state.value)
    return Object.keys(query)
      .sort()
      .map((name) => `${name}=${String(query[name])}`)
      .join('&')
  })

  async function navigate(next: S, replace: boolean): Promise<void> {
    const query = writeQuery(codecs, next, route.query)
    if (sameQuery(query, route.query)) return
    await (replace ? router.replace({ query, hash: route.hash }) : router.push({ query, hash: route.hash }))
  }

  return {
    state,
    key,
    update: (patch, options = {}) => navigate({ ...state.value, ...patch }, options.replace ?? false),
    reset: (keys, options = {}) => {
      const next = { ...state.value }
      for (const name of keys ?? (Object.keys(codecs) as (keyof S)[])) next[name] = defaults[name]
      return navigate(next, options.replace ?? false)
    },
  }
}
