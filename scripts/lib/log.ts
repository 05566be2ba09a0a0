/** Console output of the project's own scripts, prefixed so it stands out from the tools they run. */
export function say(message: string): void {
  console.log(`[spinwright] ${message}`)
}

export function fail(message: string): never {
  console.error(`[spinwright] ${message}`)
  process.exit(1)
}
