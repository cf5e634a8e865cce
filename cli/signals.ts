/** A command that shuts down on its own (the preview server) takes SIGINT and SIGTERM from the entry's default. */
let handler: ((signal: 'SIGINT' | 'SIGTERM') => void) | undefined;

export function takeSignals(h: ((signal: 'SIGINT' | 'SIGTERM') => void) | undefined): void {
  handler = h;
}

export function signalHandler(): ((signal: 'SIGINT' | 'SIGTERM') => void) | undefined {
  return handler;
}
