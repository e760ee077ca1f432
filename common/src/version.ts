/** Recorded with every evaluation and issued revision, so a result can be traced to the engine that made it. */
export const ENGINE_VERSION = '0.1.0';
