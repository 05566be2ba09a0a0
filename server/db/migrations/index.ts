import { Foundation1764626400000 } from './1764626400000-foundation'

/** Every migration in order; the data source takes the classes, not a glob. */
export const migrations = [Foundation1764626400000]
