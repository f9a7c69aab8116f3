/**
 * Fake contexts for the table kind's tests.
 *
 * @module
 */
import { DEFAULT_SETTINGS } from "../../kernel/document/mod.ts";
import type { DocSettings, FileData, ParseContext, RunContext } from "../../kernel/contract/mod.ts";

/** Default document settings (the kernel's defaults). */
export const SETTINGS: DocSettings = { ...DEFAULT_SETTINGS, title: "test", extra: {} };

/**
 * A parse context for `options`, collecting warnings.
 *
 * @param options The cell's YAML options as data.
 * @returns The context and its warnings.
 */
export function parseCtx(options: Record<string, unknown>): ParseContext & { warnings: string[] } {
  const warnings: string[] = [];
  return {
    name: "t",
    kind: "table",
    options,
    body: "",
    settings: SETTINGS,
    warn: (m) => warnings.push(m),
    warnings,
  };
}

/**
 * A run context with files given as text (or bytes), collecting warnings.
 *
 * @param files File contents by path.
 * @param settings Overrides of the document settings.
 * @returns The context and its warnings.
 */
export function runCtx(
  files: Record<string, string | Uint8Array> = {},
  settings: Partial<DocSettings> = {},
): RunContext & { warnings: string[] } {
  const warnings: string[] = [];
  const data: Record<string, FileData> = {};
  for (const [path, content] of Object.entries(files)) {
    const bytes = typeof content === "string" ? new TextEncoder().encode(content) : content;
    data[path] = { path, bytes, sha256: `sha-of-${path}` };
  }
  return {
    name: "t",
    settings: { ...SETTINGS, ...settings },
    inputs: {},
    files: data,
    warn: (m) => warnings.push(m),
    progress: () => {},
    warnings,
  };
}
