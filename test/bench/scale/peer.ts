/**
 * The peer of the side-by-side benchmark: Debian's Python with Debian's
 * `python3-pandas` and `python3-statsmodels`, installed by the bench with
 * `apt-get install -y` when missing (the benchmark machine runs as root;
 * `apt-get update` once more when the package lists are empty or stale).
 * Where that cannot be done (no Debian Python, no apt, no network, not
 * root) the side-by-side is skipped with one sentence saying why.
 *
 * Debian's interpreter is named by path: a `python3` earlier on the PATH
 * (pyenv, a virtual environment) does not see Debian's packages.
 *
 * @module
 */

/** The interpreter that Debian's python3-* packages install into. */
export const DEBIAN_PYTHON = "/usr/bin/python3";
const PACKAGES = ["python3-pandas", "python3-statsmodels"];
const APT_LIMIT_MS = 10 * 60_000;

/** The peer, ready, or why not. */
export type Peer =
  | { python: string; versions: string; installed: boolean }
  | { skipped: string };

async function run(cmd: string, args: string[], env?: Record<string, string>) {
  try {
    const out = await new Deno.Command(cmd, {
      args,
      env,
      stdin: "null",
      stdout: "piped",
      stderr: "piped",
      signal: AbortSignal.timeout(APT_LIMIT_MS),
    }).output();
    const text = new TextDecoder().decode(out.stdout) + new TextDecoder().decode(out.stderr);
    return { ok: out.success, text };
  } catch (e) {
    return { ok: false, text: e instanceof Error ? e.message : String(e) };
  }
}

/** The versions line, or null when pandas or statsmodels does not import. */
async function versions(): Promise<string | null> {
  const r = await run(DEBIAN_PYTHON, [
    "-c",
    "import sys, pandas, statsmodels; " +
    "print(f'Python {sys.version.split()[0]}, pandas {pandas.__version__}, " +
    "statsmodels {statsmodels.__version__}')",
  ]);
  return r.ok ? r.text.trim().split("\n").at(-1)! : null;
}

/** The last non-empty line apt printed, for the sentence that says why. */
function lastLine(text: string): string {
  return text.trim().split("\n").filter((l) => l.trim()).at(-1)?.trim() ?? "no output";
}

/**
 * Makes the peer ready: checks Debian's Python for pandas and statsmodels
 * and installs them with apt when missing.
 *
 * @param say Where a line of progress goes (the install takes a minute).
 * @returns The interpreter and its versions, or the reason the side-by-side is skipped.
 */
export async function preparePeer(say: (line: string) => void = () => {}): Promise<Peer> {
  try {
    await Deno.stat(DEBIAN_PYTHON);
  } catch {
    return { skipped: `there is no ${DEBIAN_PYTHON} (Debian's Python) to run it` };
  }
  const found = await versions();
  if (found) return { python: DEBIAN_PYTHON, versions: found, installed: false };
  say(`installing ${PACKAGES.join(" and ")} with apt-get`);
  const env = { DEBIAN_FRONTEND: "noninteractive" };
  let r = await run("apt-get", ["install", "-y", "-q", ...PACKAGES], env);
  if (!r.ok && !/permission denied|are you root/i.test(r.text)) {
    const update = await run("apt-get", ["update", "-q"], env);
    if (update.ok) r = await run("apt-get", ["install", "-y", "-q", ...PACKAGES], env);
  }
  const now = r.ok ? await versions() : null;
  if (now) return { python: DEBIAN_PYTHON, versions: now, installed: true };
  return {
    skipped: `apt-get could not install ${PACKAGES.join(" and ")} (${lastLine(r.text)})`,
  };
}
