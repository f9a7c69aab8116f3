/**
 * Inline values for the page: the kernel's resolver (kernel/document
 * `inline_value.ts`), so the live page, the record and `plumb run` agree.
 *
 * @module
 */
export { formatValue, type Resolved, resolveValue } from "../kernel/document/inline_value.ts";
