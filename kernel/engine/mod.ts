/**
 * Database access (issue 18): the query check, the engine processes and
 * their client, and the contract kinds see through `RunContext.engine`.
 *
 * @module
 */
export { checkQuery, type QueryRefusal } from "./guard.ts";
export { answerBuffers, EngineClient } from "./client.ts";
export { QUERY_TIME_LIMIT_DEFAULT } from "./types.ts";
export type {
  DatabaseRef,
  EngineAccess,
  EngineAnswer,
  EngineAskOptions,
  EngineColumn,
  EngineProgress,
  EngineRFactor,
  EngineRows,
  EngineStop,
} from "./types.ts";
