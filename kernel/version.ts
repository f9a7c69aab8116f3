/** Plumb's version, written into RUN-JSON and the record. */
export const VERSION = "0.1.0";
