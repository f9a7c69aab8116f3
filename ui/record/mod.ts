/**
 * The static record of an analysis (`plumb export`): rendered on the server
 * from the kinds' page faces into one self-contained HTML file.
 *
 * @module
 */
export { CAUTION, Record, renderRecord } from "./record.tsx";
export type { RecordBlock, RecordFile, RecordInput } from "./types.ts";
export { gatherRecord, recordTime, type RunFacts } from "./gather.ts";
