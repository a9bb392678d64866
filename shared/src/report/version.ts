/** The engine's version: the one place it is written (reports, packages and the CLI read it). */
export const ENGINE_VERSION = '0.2.0';
