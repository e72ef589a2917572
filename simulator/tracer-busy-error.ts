/** Thrown when a change needs the tracer idle (no sweep running). */
export class TracerBusyError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'TracerBusyError';
  }
}
