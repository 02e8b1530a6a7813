/**
 * The version of paygrove; kept equal to `deno.json`'s by a test.
 *
 * @module
 */

/** paygrove's version (semantic versioning). */
export const VERSION = "0.1.0";
