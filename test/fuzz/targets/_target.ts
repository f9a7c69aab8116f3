/**
 * What a fuzz target is: how it makes an input from its generator, how it
 * checks one, and how the shrinker reaches its main text.
 *
 * @module
 */
import type { Corpus } from "../_corpus.ts";
import type { Rng } from "../_rng.ts";

/** One fuzz target. Inputs are plain JSON data, so a fixture can hold one. */
export interface Target<I = unknown> {
  /** The name used by `--target` and in fixtures. */
  name: string;
  /** One sentence: what is fed to what. */
  about: string;
  /** Makes an input from the input's generator. */
  make(rng: Rng, corpus: Corpus): I;
  /**
   * Feeds the input to the code under test and checks the oracle.
   *
   * @throws {Defect} On an oracle violation (see `_oracle.ts`).
   */
  check(input: I): void | Promise<void>;
  /** The input's main text (what the shrinker cuts). */
  text(input: I): string;
  /** The input with its main text replaced. */
  withText(input: I, text: string): I;
  /** Releases what checking kept (a session and its worker). */
  close?(): void;
}
