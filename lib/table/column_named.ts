/**
 * Finding a column an option names, with the one message every option
 * gives when the name is not there.
 *
 * @module
 */

import { OptionError } from "../errors.ts";
import type { Column, Table } from "./types.ts";

/**
 * The column called `name`.
 *
 * @param option The option that named it, for the message (e.g. `--within`).
 * @throws {OptionError} naming the columns there are.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { loadTable } from "./load_table.ts";
 * import { columnNamed } from "./column_named.ts";
 * const table = loadTable("site,pay\nNorth,50\nSouth,60\n");
 * assert(columnNamed(table, "site", "--where").name === "site");
 * assert.throws(() => columnNamed(table, "sites", "--where"), /no column named "sites"; the columns are: site, pay/);
 * ```
 */
export function columnNamed(table: Pick<Table, "columns">, name: string, option: string): Column {
  const found = table.columns.find((c) => c.name === name);
  if (found === undefined) {
    throw new OptionError(
      `${option}: no column named "${name}"; the columns are: ${
        table.columns.map((c) => c.name).join(", ")
      }`,
    );
  }
  return found;
}
