/** The time source of everything that expires (sessions, one-time links, throttles); tests pass a fake one. */
export interface Clock {
  /** Milliseconds since the epoch. */
  now(): number;
}

export const systemClock: Clock = { now: () => Date.now() };
