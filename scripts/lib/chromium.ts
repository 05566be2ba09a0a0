import { existsSync } from 'node:fs'
import { aptInstall } from './mariadb'
import { say } from './log'

const CANDIDATES = [process.env.CHROMIUM_PATH, '/usr/bin/chromium', '/usr/bin/chromium-browser'].filter(
  (candidate): candidate is string => typeof candidate === 'string' && candidate.length > 0,
)

/** Debian's Chromium for the end-to-end tests; installed with apt-get when missing (never a browser download). */
export function ensureChromium(): string {
  const found = CANDIDATES.find((candidate) => existsSync(candidate))
  if (found) return found
  if (process.getuid?.() !== 0) throw new Error('Chromium is not installed. Install it with: sudo apt-get install -y chromium')
  say('installing chromium from Debian packages (apt-get) ...')
  aptInstall(['chromium'])
  if (!existsSync('/usr/bin/chromium')) throw new Error('apt-get installed chromium but /usr/bin/chromium is missing')
  return '/usr/bin/chromium'
}
