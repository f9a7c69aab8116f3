/**
 * A coarse shared clock for ticking elapsed times and ages: one signal,
 * updated every 250 ms while the page is open (components read it; those
 * that do not, do not re-render).
 *
 * @module
 */
import { signal } from "@preact/signals";

/** The local time in ms since the epoch, updated by {@link startClock}. */
export const now = signal(Date.now());

/**
 * Starts the clock (browser only).
 *
 * @param everyMs The tick.
 * @returns A function that stops it.
 */
export function startClock(everyMs = 250): () => void {
  const id = setInterval(() => {
    now.value = Date.now();
  }, everyMs);
  return () => clearInterval(id);
}
