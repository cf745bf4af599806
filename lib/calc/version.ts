/** Recorded with every evaluation and every saved version. Bump on any change that can alter a result. */
export const ENGINE_VERSION = 'worldsheet-calc 1.5.0 (mathjs 15.2.0)';
