/**
 * One document kept running for the browsers that watch it.
 *
 * ```
 *  watcher / save ─request()─▶ snapshot: document text + SHA-256 of every data file
 *                                 │ same as the last finished run? ──▶ nothing to do
 *                                 │ a run is going and this differs? ──▶ supersede it
 *                                 ▼
 *                  one run at a time through the Session (cache by content key)
 *                                 │ onEvent ──▶ {type:"cell"} to every browser
 *                                 ▼
 *                           {type:"run", ran, ms}
 *                                 │ recordRun (kernel/history): a record appended when the
 *                                 ▼ inputs differ from the last one's
 *                           {type:"changes", report, notes}   (kept for browsers that connect later)
 * ```
 *
 * Runs never overlap: a newer snapshot makes the running one stop at its next
 * cell (what it computed stays cached), then runs itself, so each content is
 * computed once and the browsers end with the newest state.
 *
 * A run's messages (the document's, when its text or data changed, then the
 * cells') are held back for {@link BUSY_GRACE_MS} from its start, a cell's
 * later message replacing its earlier one, and sent together
 * when the run ends or the grace is over, whichever comes first; after it
 * they go out as they happen. So a short run (most updates) takes the page
 * from one consistent state to the next in one redraw, with no
 * queued–computing flicker and no half-updated page (new fits beside an old
 * comparison), and the page does not compete with the computation for the
 * processor meanwhile (measured on two cores: the server's run 103 → 70 ms,
 * the update as seen in the page p50 145 → 122 ms); a long run still shows
 * busy states, progress and each result as it comes.
 *
 * A database has no modification time to watch: after a run that read one
 * (`CellKind.stamp`, a query's fingerprint), the workspace asks every
 * fingerprint again after {@link recheckDelay} and reruns the document when
 * one changed, so the page follows a database that changes under it.
 *
 * A cell's result stays the JSON text the compute worker wrote for the page
 * (`CellReport.page`) all the way to the socket: the live channel splices it
 * into each frame's text (live_channel.ts).
 *
 * @module
 */
import { basename, dirname, resolve } from "node:path";
import type { OptionPath } from "../contract/mod.ts";
import { type ParsedDocument, readSettings } from "../document/mod.ts";
import { hashValue, sha256Hex } from "../hash.ts";
import type { Registry } from "../contract/mod.ts";
import { type RunReport, Session, type SessionEvent } from "../session/session.ts";
import { documentMessage, type FileInfo } from "./document_message.ts";
import type { Outgoing, OutgoingCell } from "./live_channel.ts";
import type { ChangesMessage, DocumentMessage } from "./protocol.ts";
import { type HistoryCache, recordRun } from "../history/mod.ts";

/** Options of a live workspace. */
export interface LiveOptions {
  /** The document's path (as given; messages carry it). */
  path: string;
  registry: Registry;
  workerUrl: URL;
  /** Called with every message, in order (a cell's result as the worker's JSON text). */
  send: (msg: Outgoing) => void;
  /** Called with several messages to deliver together, in order (default: `send` each). */
  sendMany?: (msgs: Outgoing[]) => void;
  /** How long cell messages are held back from the start of a run (default {@link BUSY_GRACE_MS}). */
  busyGraceMs?: number;
  /** Milliseconds between asks of the database fingerprints (default {@link recheckDelay}). */
  recheckMs?: number;
}

/**
 * How long to wait before asking the database fingerprints again: twenty
 * times what asking them last cost, so rechecking keeps a database at most
 * about 5% busy, and between 15 s and 10 min (common practice for polling a
 * source without change notices, no source).
 *
 * @param costMs What the last asks took together, in milliseconds.
 * @returns The wait in milliseconds.
 */
export function recheckDelay(costMs: number): number {
  return Math.min(600_000, Math.max(15_000, 20 * costMs));
}

/**
 * How long a run's cell messages are held back (ms): about the shortest wait
 * a reader notices, and longer than most updates take to settle (common
 * practice for progress indicators, no source).
 */
export const BUSY_GRACE_MS = 200;

/** The latest complete run: what the page's "record" link exports. */
export interface LastRun {
  source: string;
  report: RunReport;
  startedMs: number;
  durationMs: number;
  /** What changed since the previous data revision, as the page was last told. */
  changes: ChangesMessage | null;
}

interface Snapshot {
  source: string;
  /** The parsed document (the session's, shared). */
  doc: ParsedDocument;
  version: string;
  print: string;
  files: FileInfo[];
}

/** A document, its session and the latest state of every cell. */
export class LiveWorkspace {
  #opts: LiveOptions;
  #abs: string;
  #session: Session;
  #doc: DocumentMessage | null = null;
  #kinds = new Map<string, string>();
  #cells = new Map<string, OutgoingCell>();
  #started = new Map<string, number>();
  /** Cell messages held back during this run's grace period, in order, the latest per cell. */
  #held = new Map<string, OutgoingCell>();
  /** The document message held back with them (the latest). */
  #heldDoc: DocumentMessage | null = null;
  #graceTimer: ReturnType<typeof setTimeout> | null = null;
  /** The next ask of the database fingerprints, when a run read a database. */
  #recheckTimer: ReturnType<typeof setTimeout> | null = null;
  #closed = false;
  #graceOver = true;
  #run = 0;
  #runningPrint: string | null = null;
  #donePrint: string | null = null;
  #dirty = false;
  #loop: Promise<void> | null = null;
  #lastRun: LastRun | null = null;
  /** The latest `changes` message (sent again to browsers that connect later). */
  #changes: ChangesMessage | null = null;
  /** The run history as this workspace last wrote it (not read again while unchanged on disk). */
  #history: HistoryCache = { state: null };

  /** @param opts Document path, kinds, worker entry and the message sink. */
  constructor(opts: LiveOptions) {
    this.#opts = opts;
    this.#abs = resolve(opts.path);
    this.#session = new Session({
      registry: opts.registry,
      workerUrl: opts.workerUrl,
      dir: dirname(this.#abs),
      page: true,
      history: true,
      onEvent: (e) => this.#onEvent(e),
    });
  }

  /** The latest run that was not superseded, or null before the first. */
  get lastRun(): LastRun | null {
    return this.#lastRun;
  }

  /** The absolute path of the document. */
  get documentPath(): string {
    return this.#abs;
  }

  /** How many times each cell was computed (for tests and benchmarks). */
  get runs(): ReadonlyMap<string, number> {
    return this.#session.runs;
  }

  /**
   * A cell's last result as the page has it (its page copy), for add-cell
   * templates: parsed from the worker's text on each call (rare).
   *
   * @param name The cell's name.
   * @returns The result, or null when the cell has none.
   */
  resultOf(name: string): unknown {
    const text = this.#cells.get(name)?.result;
    return text === undefined ? null : JSON.parse(text.json);
  }

  /**
   * The messages that bring a newly connected browser up to date.
   *
   * @returns The document message, then the latest message of every cell.
   */
  welcome(): Outgoing[] {
    if (!this.#doc) return [];
    return [this.#doc, ...this.#cells.values(), ...(this.#changes ? [this.#changes] : [])];
  }

  /**
   * Asks for a run after a change: forgets the changed files' cached content,
   * supersedes a running run when the content now differs, and runs when the
   * content differs from that of the last finished run.
   *
   * @param changed Absolute paths reported changed (none: check everything).
   * @returns When the workspace is idle again.
   */
  async request(changed: Iterable<string> = []): Promise<void> {
    for (const p of changed) this.#session.files.forget(p);
    this.#dirty = true;
    if (this.#loop) {
      if (this.#runningPrint !== null) {
        const snap = await this.#snapshot();
        if (snap && snap.print !== this.#runningPrint) {
          this.#session.supersede();
          // A long cell whose inputs changed (a search) stops now rather than at its end.
          const shas = new Map(snap.files.flatMap((f) => f.sha256 ? [[f.path, f.sha256]] : []));
          this.#session.stopComputingUnless(this.#session.plan(snap.source, shas).keys.values());
        }
      }
      return this.#loop;
    }
    this.#loop = (async () => {
      try {
        while (this.#dirty) {
          this.#dirty = false;
          await this.#once();
        }
      } finally {
        this.#loop = null;
      }
    })();
    return this.#loop;
  }

  /** @returns A promise settled when no run is going or pending. */
  idle(): Promise<void> {
    return this.#loop ?? Promise.resolve();
  }

  /**
   * Reads the document as on disk.
   *
   * @returns Its text and version (hex SHA-256 of the bytes).
   * @throws {Deno.errors.NotFound} When the document is gone.
   */
  async readDisk(): Promise<{ source: string; version: string }> {
    const bytes = await Deno.readFile(this.#abs);
    return { source: new TextDecoder().decode(bytes), version: await sha256Hex(bytes) };
  }

  async #snapshot(): Promise<Snapshot | null> {
    let disk;
    try {
      disk = await this.readDisk();
    } catch (err) {
      if (err instanceof Deno.errors.NotFound) return null; // mid-replace; the next event follows
      throw err;
    }
    const plan = this.#session.plan(disk.source, new Map());
    const files: FileInfo[] = [];
    for (const node of plan.graph.nodes) {
      for (const f of node.error ? [] : node.files) {
        if (files.some((x) => x.path === f.path)) continue;
        files.push(await this.#fileInfo(f.path, f.option, plan.settings.maxFileBytes));
      }
    }
    const print = hashValue([disk.version, files.map((f) => [f.path, f.sha256])]);
    return { ...disk, print, files, doc: plan.doc };
  }

  async #fileInfo(path: string, option: OptionPath, max: number): Promise<FileInfo> {
    try {
      const data = await this.#session.files.read(path, option, max);
      const abs = this.#session.files.resolvePath(path, option);
      const info = await Deno.stat(abs);
      return { path, sha256: data.sha256, bytes: data.bytes, mtime: info.mtime };
    } catch {
      return { path, sha256: null, bytes: null, mtime: null };
    }
  }

  async #once(): Promise<void> {
    const snap = await this.#snapshot();
    if (!snap || snap.print === this.#donePrint) return;
    const t0 = performance.now();
    this.#startGrace();
    if (snap.version !== this.#doc?.version || this.#dataChanged(snap)) {
      this.#setDocument(snap);
    }
    const run = ++this.#run;
    this.#runningPrint = snap.print;
    try {
      const startedMs = Date.now();
      const report = await this.#session.run(snap.source);
      if (report.superseded) return;
      this.#donePrint = snap.print;
      this.#lastRun = {
        source: snap.source,
        report,
        startedMs,
        durationMs: Date.now() - startedMs,
        changes: this.#changes,
      };
      this.#endGrace({
        type: "run",
        version: snap.version,
        run,
        ran: report.ran,
        ms: Math.round(performance.now() - t0),
        errors: report.errors,
      });
      await this.#record(snap, report);
      this.#scheduleRecheck();
    } finally {
      this.#runningPrint = null;
    }
  }

  /** Asks the database fingerprints again later, when the document read any. */
  #scheduleRecheck(): void {
    if (this.#recheckTimer !== null) clearTimeout(this.#recheckTimer);
    this.#recheckTimer = null;
    const { count, costMs } = this.#session.stamps;
    if (count === 0 || this.#closed) return;
    const wait = this.#opts.recheckMs ?? recheckDelay(costMs);
    this.#recheckTimer = setTimeout(() => this.#recheck(), wait);
    // A pending recheck never keeps the server's process alive by itself.
    Deno.unrefTimer(this.#recheckTimer as unknown as number);
  }

  async #recheck(): Promise<void> {
    this.#recheckTimer = null;
    if (this.#closed) return;
    if (this.#loop) {
      // A run is going: it schedules the next recheck when it ends.
      return;
    }
    let changed = false;
    try {
      changed = await this.#session.recheckStamps();
    } catch { /* stamps never throw; a failure counts as changed inside */ }
    if (this.#closed) return;
    if (changed) {
      this.#donePrint = null; // the same text and files, another database answer
      await this.request();
    } else this.#scheduleRecheck();
  }

  /**
   * Records a finished run in the document's history and tells the browsers
   * what changed, when that differs from what they were last told. The
   * history never stops the workspace: a failure is a note in the message.
   */
  async #record(snap: Snapshot, report: RunReport): Promise<void> {
    let msg: ChangesMessage;
    try {
      const inputs = new Map(report.cells.map((c) => [c.name, c.inputs ?? []]));
      const r = await recordRun({
        document: this.#abs,
        documentSha256: snap.version,
        report,
        registry: this.#opts.registry,
        inputsOf: (cell) => inputs.get(cell) ?? [],
        cache: this.#history,
      });
      if (r === null) msg = { type: "changes", report: null, notes: [] }; // history: off
      else msg = { type: "changes", report: r.report, notes: r.notes };
    } catch (err) {
      msg = {
        type: "changes",
        report: null,
        notes: [`The run history failed: ${(err as Error).message}`],
      };
    }
    const same = this.#changes !== null && JSON.stringify(this.#changes) === JSON.stringify(msg);
    this.#changes = msg;
    if (this.#lastRun) this.#lastRun.changes = msg;
    if (!same) this.#opts.send(msg);
  }

  /** Starts a run's grace period (busy states of a superseded run still held stay held). */
  #startGrace(): void {
    if (this.#graceTimer !== null) clearTimeout(this.#graceTimer);
    const grace = this.#opts.busyGraceMs ?? BUSY_GRACE_MS;
    this.#graceOver = grace <= 0;
    if (this.#graceOver) return;
    this.#graceTimer = setTimeout(() => {
      this.#graceTimer = null;
      this.#endGrace();
    }, grace);
  }

  /**
   * Ends the grace period: messages still held are sent now, together, with
   * the run's own message when the run ended; later ones go out at once.
   */
  #endGrace(last?: Outgoing): void {
    if (this.#graceTimer !== null) clearTimeout(this.#graceTimer);
    this.#graceTimer = null;
    this.#graceOver = true;
    const doc = this.#heldDoc;
    const held = [...this.#held.values()];
    this.#heldDoc = null;
    this.#held.clear();
    const version = this.#doc?.version;
    const out: Outgoing[] = [
      ...(doc ? [doc] : []),
      ...held.filter((m) => m.version === version),
    ];
    if (last) out.push(last);
    if (out.length === 1) this.#opts.send(out[0]);
    else if (this.#opts.sendMany) this.#opts.sendMany(out);
    else for (const m of out) this.#opts.send(m);
  }

  #dataChanged(snap: Snapshot): boolean {
    const old = this.#doc?.data ?? [];
    return snap.files.length !== old.length ||
      snap.files.some((f, i) =>
        old[i].path !== f.path || old[i].bytes !== (f.bytes?.length ?? 0) ||
        old[i].changed !== (f.mtime?.toISOString() ?? "")
      );
  }

  #setDocument(snap: Snapshot): void {
    const doc = snap.doc;
    const title = doc.frontMatter
      ? readSettings(doc).settings.title
      : basename(this.#opts.path).replace(/\.md$/i, "");
    this.#doc = documentMessage(this.#opts.path, snap.version, title, doc, snap.files);
    this.#kinds.clear();
    for (const b of this.#doc.blocks) if (b.type === "cell") this.#kinds.set(b.name, b.kind);
    for (const name of [...this.#cells.keys()]) {
      if (!this.#kinds.has(name)) {
        this.#cells.delete(name);
      }
    }
    if (this.#graceOver) this.#opts.send(this.#doc);
    else this.#heldDoc = this.#doc; // sent first when the grace ends, before the cells' messages
  }

  #onEvent(e: SessionEvent): void {
    const version = this.#doc?.version ?? "";
    const msg: OutgoingCell = {
      type: "cell",
      version,
      name: e.name,
      kind: this.#kinds.get(e.name) ?? "",
      state: e.state,
      run: this.#run,
    };
    if (e.state === "computing") {
      if (e.fraction === undefined) this.#started.set(e.name, performance.now());
      const t = this.#started.get(e.name);
      if (t !== undefined) msg.ms = Math.round(performance.now() - t);
      if (e.fraction !== undefined) msg.fraction = e.fraction;
      if (e.note !== undefined) msg.note = e.note;
    }
    const r = e.report;
    if (r) {
      msg.ms = r.ms;
      msg.warnings = r.warnings;
      msg.cached = r.cached;
      if (r.error) msg.error = r.error;
      if (r.state === "current") {
        if (r.page) msg.result = r.page;
        if (r.omitted) msg.omitted = r.omitted;
        if (r.summaryLine !== null) msg.summaryLine = r.summaryLine;
      }
      this.#started.delete(e.name);
    }
    this.#cells.set(e.name, msg);
    if (!this.#graceOver) {
      // Held in order; a cell's later message replaces its earlier one.
      this.#held.delete(e.name);
      this.#held.set(e.name, msg);
      return;
    }
    this.#held.delete(e.name);
    this.#opts.send(msg);
  }

  /** Stops the session's worker. */
  close(): void {
    this.#closed = true;
    if (this.#graceTimer !== null) clearTimeout(this.#graceTimer);
    if (this.#recheckTimer !== null) clearTimeout(this.#recheckTimer);
    this.#session.close();
  }
}
