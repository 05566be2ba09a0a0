// Entry of a selection worker thread: TypeScript through tsx's loader, registered in this thread
// (a worker does not inherit the loader of a parent that was not started by the tsx command).
import { register } from 'tsx/esm/api'

register()
await import('./selection-worker.ts')
