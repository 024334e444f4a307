/** Semantic version of the lib/aero facade (bump the major on any breaking change). */
export const AERO_LIBRARY_VERSION = "1.0.0";
