/**
 * The version of paygrove; kept equal to `deno.json`'s by a test.
 *
 * @module
 */

/**
 * paygrove's version (semantic versioning).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { VERSION } from "./version.ts";
 * const config = JSON.parse(Deno.readTextFileSync(new URL("../deno.json", import.meta.url)));
 * assert.equal(VERSION, config.version);
 * assert.match(VERSION, /^\d+\.\d+\.\d+$/);
 * ```
 */
export const VERSION = "0.1.0";
