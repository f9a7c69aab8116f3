/**
 * Cache keys: a fast, non-cryptographic 128-bit hash of canonical JSON.
 *
 * Keys decide whether a cell reruns, so they must be stable across runs and
 * processes (no object identity, no insertion order): {@link canonicalJson}
 * sorts object keys. The hash is four independent 32-bit lanes of
 * Murmur3-style mixing (Appleby, MurmurHash3, `fmix32` finaliser); it needs
 * no `await`, which keeps planning synchronous and fast. File contents are
 * identified separately by SHA-256 ({@link sha256Hex}) because that digest
 * also goes into the record.
 *
 * @module
 */
import { fmix32, murmurStep } from "./murmur3.ts";

/**
 * JSON with object keys sorted at every depth; typed arrays become plain arrays.
 *
 * @param value Plain data.
 * @returns A string equal for equal data.
 * @example
 * ```ts
 * import { canonicalJson } from "./hash.ts";
 * if (canonicalJson({ b: 1, a: [2] }) !== canonicalJson({ a: [2], b: 1 })) throw new Error();
 * ```
 */
export function canonicalJson(value: unknown): string {
  return JSON.stringify(value, (_key, v) => {
    if (v && typeof v === "object" && !Array.isArray(v)) {
      if (ArrayBuffer.isView(v)) return Array.from(v as unknown as ArrayLike<number>);
      const out: Record<string, unknown> = {};
      for (const k of Object.keys(v).sort()) out[k] = (v as Record<string, unknown>)[k];
      return out;
    }
    return v;
  }) ?? "undefined";
}

const SEEDS = [0x9e3779b1, 0x85ebca77, 0xc2b2ae3d, 0x27d4eb2f];

/**
 * A 128-bit hex hash of a string (32 hex digits).
 *
 * @param text Any string.
 * @returns Lower-case hex.
 * @example
 * ```ts
 * import { hashString } from "./hash.ts";
 * if (hashString("a") === hashString("b")) throw new Error("distinct inputs collide");
 * ```
 */
export function hashString(text: string): string {
  let out = "";
  for (const seed of SEEDS) {
    let h = seed ^ text.length;
    for (let i = 0; i < text.length; i++) {
      h = murmurStep(h, text.charCodeAt(i));
    }
    out += fmix32(h).toString(16).padStart(8, "0");
  }
  return out;
}

/**
 * The hash of the canonical JSON of `value`.
 *
 * @param value Plain data.
 * @returns 32 hex digits.
 */
export function hashValue(value: unknown): string {
  return hashString(canonicalJson(value));
}

/**
 * SHA-256 of bytes as lower-case hex.
 *
 * @param bytes File content.
 * @returns 64 hex digits.
 * @example
 * ```ts
 * import { sha256Hex } from "./hash.ts";
 * const h = await sha256Hex(new Uint8Array());
 * if (!h.startsWith("e3b0c442")) throw new Error("SHA-256 of nothing");
 * ```
 */
export async function sha256Hex(bytes: Uint8Array): Promise<string> {
  const digest = await crypto.subtle.digest("SHA-256", bytes as Uint8Array<ArrayBuffer>);
  return Array.from(new Uint8Array(digest), (b) => b.toString(16).padStart(2, "0")).join("");
}
