// The engine's version, stored with every run so that a result can be traced to the code that made it.

/** Version of the engine's numerical behaviour (bumped when results may change). */
export const ENGINE_VERSION = "tapwright-engine 0.1.0";
