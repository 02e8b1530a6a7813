/**
 * How much of the screen the flow has: its rows (as the terminal says,
 * else 24) and text wrapped to its width.
 *
 * @module
 */

import wrapAnsi from "wrap-ansi";
import type { FlowIO } from "./flow_io.ts";

/**
 * Text wrapped at spaces to the screen's width.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { wrapped } from "./screen_room.ts";
 * const io = { width: 20 } as unknown as import("./flow_io.ts").FlowIO;
 * assert.deepEqual(wrapped(io, "the estimate is typically off by 5%"), ["the estimate is", "typically off by 5%"]);
 * ```
 */
export function wrapped(io: FlowIO, text: string): string[] {
  return wrapAnsi(text, io.width).split("\n");
}

/**
 * Lines of the screen: as the terminal says, else 24.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { screenRows } from "./screen_room.ts";
 * assert.equal(screenRows({ rows: 40 }), 40);
 * assert.equal(screenRows({ rows: undefined }), 24);
 * assert.equal(screenRows({ rows: 0 }), 24); // a terminal that says nothing
 * ```
 */
export function screenRows(io: Pick<FlowIO, "rows">): number {
  return io.rows !== undefined && io.rows > 0 ? io.rows : 24;
}
