/**
 * The hang watchdog of a fuzz child: how long since its last line, counted
 * in processor time where Linux tells it (`/proc/<pid>/stat`, all threads),
 * so a machine busy with other work does not turn a slow input into a hang;
 * elsewhere, or when the child waits without computing (a promise that never
 * settles), in time on the clock.
 *
 * @module
 */

/** Clock ticks per second of /proc's utime and stime (USER_HZ, 100 on Linux). */
const TICKS_PER_SECOND = 100;
/** A child silent this many times the limit on the clock is stopped even if it computes nothing. */
const CLOCK_FACTOR = 5;

/** Processor time of a process so far (ms), or null where /proc cannot tell. */
function cpuMs(pid: number): number | null {
  try {
    const stat = Deno.readTextFileSync(`/proc/${pid}/stat`);
    const f = stat.slice(stat.lastIndexOf(")") + 2).split(" ");
    return ((Number(f[11]) + Number(f[12])) * 1000) / TICKS_PER_SECOND;
  } catch {
    return null;
  }
}

/** Calls `onHang` once when the child stays silent past the limit. */
export class Watchdog {
  #pid: number;
  #wall = 0;
  #cpu: number | null = null;
  #timer: ReturnType<typeof setInterval>;

  /**
   * @param pid The child's process id.
   * @param limitMs Silence allowed, in processor time (or clock time where unknown).
   * @param graceMs Clock time allowed before the child's first line (loading).
   * @param onHang Called with a description of the silence.
   */
  constructor(pid: number, limitMs: number, graceMs: number, onHang: (why: string) => void) {
    this.#pid = pid;
    this.#wall = performance.now() + graceMs;
    this.#timer = setInterval(() => {
      const wall = performance.now() - this.#wall;
      const cpu = this.#cpu === null ? null : (cpuMs(pid) ?? this.#cpu) - this.#cpu;
      const over = (cpu ?? wall) > limitMs || wall > CLOCK_FACTOR * limitMs;
      if (wall < 0 || !over) return;
      this.stop();
      const used = cpu === null ? "" : ` (${Math.round(cpu)} ms of processor time)`;
      onHang(`no answer within ${Math.round(wall)} ms${used}: killed`);
    }, 100);
  }

  /** The child spoke: start counting again. */
  heard(): void {
    this.#wall = performance.now();
    this.#cpu = cpuMs(this.#pid);
  }

  /** Stops watching. */
  stop(): void {
    clearInterval(this.#timer);
  }
}
