/**
 * One whole process timed from outside: wall time from spawn to exit and
 * peak resident memory, the operating system's own count.
 *
 * Peak memory: GNU time's `%M` (the largest resident set of the processes
 * it waited for, from `getrusage`) when /usr/bin/time is GNU time, written
 * to a file of its own so the command's streams stay the command's; else
 * the child's `VmHWM` in /proc/<pid>/status, read every 50 ms while it runs
 * (the high-water mark only grows, so the last reading before exit is the
 * peak but for a rise in its last 50 ms). Null where neither exists.
 *
 * Processor time (user + system, all threads; GNU time's `%U` and `%S`):
 * on a machine others share, wall time grows with their load and processor
 * time much less, so it is the steadier figure there. Null without GNU time.
 *
 * @module
 */

/** What one process took. */
export interface Measured {
  ms: number;
  /** Peak resident memory in MB (2^20 bytes), or null when it cannot be read here. */
  peakMb: number | null;
  /** User + system processor time in ms, or null without GNU time. */
  cpuMs: number | null;
  code: number;
  /** Standard output when asked for (`stdout: "piped"`), else "". */
  stdout: string;
  /** The last 2,000 characters of standard error. */
  stderr: string;
}

/** How to run it. */
export interface MeasureOptions {
  cwd?: string | URL;
  /** "null" sends standard output to /dev/null, as `> /dev/null` does. */
  stdout?: "piped" | "null";
  env?: Record<string, string>;
  /** How peak memory is read; default: GNU time where present, else /proc. */
  peak?: "time" | "proc";
}

let gnuTime: boolean | undefined;

/** Whether /usr/bin/time is GNU time (it understands `-f %M -o FILE`). */
export async function hasGnuTime(): Promise<boolean> {
  if (gnuTime !== undefined) return gnuTime;
  try {
    const out = await new Deno.Command("/usr/bin/time", {
      args: ["-f", "%M", "true"],
      stdout: "null",
      stderr: "piped",
    }).output();
    gnuTime = out.success && /^\d+\s*$/.test(new TextDecoder().decode(out.stderr));
  } catch {
    gnuTime = false;
  }
  return gnuTime;
}

/**
 * The high-water mark of a process's resident memory in kB, or null once it
 * is gone. Read through `cat`: Deno lets only a process with every
 * permission open /proc, and the bench runs with fewer.
 */
async function vmHwmKb(pid: number): Promise<number | null> {
  try {
    const out = await new Deno.Command("cat", {
      args: [`/proc/${pid}/status`],
      stdout: "piped",
      stderr: "null",
    }).output();
    const m = /^VmHWM:\s+(\d+) kB/m.exec(new TextDecoder().decode(out.stdout));
    return m ? Number(m[1]) : null;
  } catch {
    return null;
  }
}

/**
 * Runs `command` as a new process and measures it.
 *
 * @param command The program and its arguments.
 * @param options Working folder, where standard output goes, how peak memory is read.
 * @returns Wall time, peak memory, exit code and what it printed.
 */
export async function measure(command: string[], options: MeasureOptions = {}): Promise<Measured> {
  const viaTime = (options.peak ?? "time") === "time" && await hasGnuTime();
  const peakFile = viaTime ? await Deno.makeTempFile({ prefix: "plumb-peak-" }) : "";
  const [cmd, ...args] = viaTime
    ? ["/usr/bin/time", "-f", "%U %S %M", "-o", peakFile, ...command]
    : command;
  const t0 = performance.now();
  const child = new Deno.Command(cmd, {
    args,
    cwd: options.cwd,
    env: options.env,
    stdin: "null",
    stdout: options.stdout ?? "piped",
    stderr: "piped",
  }).spawn();
  let hwm: number | null = null, done = false;
  const poll = async () => {
    while (!done) {
      hwm = (await vmHwmKb(child.pid)) ?? hwm;
      await new Promise((r) => setTimeout(r, 50));
    }
  };
  const polling = viaTime ? Promise.resolve() : poll();
  const out = await child.output();
  const ms = performance.now() - t0;
  done = true;
  await polling;
  let kb: number | null = hwm, cpuMs: number | null = null;
  if (viaTime) {
    // "Command exited with non-zero status N" may come first.
    const text = await Deno.readTextFile(peakFile);
    await Deno.remove(peakFile);
    const m = /([\d.]+) ([\d.]+) (\d+)\s*$/.exec(text);
    kb = m ? Number(m[3]) : null;
    cpuMs = m ? (Number(m[1]) + Number(m[2])) * 1000 : null;
  }
  const decode = (b: Uint8Array) => new TextDecoder().decode(b);
  return {
    ms,
    peakMb: kb === null ? null : kb / 1024,
    cpuMs,
    code: out.code,
    stdout: options.stdout === "null" ? "" : decode(out.stdout),
    stderr: decode(out.stderr).slice(-2000),
  };
}
