/**
 * Fixtures that still fail: crashes the fuzzer found in other engineers'
 * areas, routed to them and not yet fixed. The replay test reports each of
 * these on every run (as "known open") instead of failing, and fails when a
 * listed fixture passes, so this list shrinks as fixes land and never hides
 * a fixed defect. Name → where it breaks, and whose area the fix is in.
 *
 * @module
 */
export const KNOWN_OPEN: Readonly<Record<string, string>> = {};
