/**
 * The version of the computation core, stamped on every report. A stored report made by
 * another version is shown marked and computed again. Raise it with every change to
 * what the core computes or how it words the record (a test compares it with the
 * record's format number below, so a change of the step schema cannot forget it).
 */
export const ENGINE_VERSION = '2026.12.03-8';
