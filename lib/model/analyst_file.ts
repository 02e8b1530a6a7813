/**
 * The analyst's file: the part of a model that, with a staff list,
 * rebuilds every person's pay (each tree's resampling state and the
 * training rows' keys; see {@linkcode AnalystPart}). It is written only
 * when asked for, beside a model file it names by the SHA-256 of its bytes,
 * readable by its owner alone (mode 0600), and says what it is in its own
 * text. With it, a model answers what needs the trees' in-bag rows at
 * question time: the out-of-bag estimate of a training row (`batch`,
 * `estimate --row`) and the infinitesimal jackknife.
 *
 * @module
 */

import { z } from "zod";
import { DataError } from "../errors.ts";
import { writeFileAtomic } from "../io/atomic_write.ts";
import { readTextBounded } from "../io/read_bounded.ts";
import {
  arrayFromBase64,
  arrayToBase64,
  withChecksum,
  withoutChecksum,
} from "../io/checked_json.ts";
import { STATE_WORDS } from "../ensemble/bootstrap.ts";
import type { AnalystPart, Model } from "./types.ts";

const MARKER = "paygrove-analyst-file";
const FORMAT = 1;

/**
 * What the file says of itself, in its own text.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { ANALYST_FILE_WARNING, analystToText } from "./analyst_file.ts";
 * const model = {
 *   rows: { used: 2, dropped: 0 },
 *   ensemble: { trees: [{}], alpha: 0 },
 *   analyst: { resamples: Int32Array.of(1, 2, 3, 4), rowKeys: "AAAAAAAAAAA=BBBBBBBBBBB=" },
 * } as unknown as import("./types.ts").Model;
 * // The file carries the warning in its own text, for whoever opens it.
 * assert.equal(JSON.parse(analystToText(model, "a".repeat(64))).warning, ANALYST_FILE_WARNING);
 * ```
 */
export const ANALYST_FILE_WARNING = "With a staff list (the table's rows without pay), this " +
  "file rebuilds every person's pay in the model's table to the cent. Keep it where the pay " +
  "table is kept; never share it. The model file it goes with is safe to share without it.";

// Declared on the first read, as the model file's schemas are (a schema
// costs start-up time where it is declared).
let shape: ReturnType<typeof declareShape> | undefined;
const fileShape = () => shape ??= declareShape();
function declareShape() {
  return z.object({
    kind: z.literal(MARKER),
    format: z.literal(FORMAT),
    warning: z.string(),
    model: z.object({
      sha256: z.string().regex(/^[0-9a-f]{64}$/),
      trees: z.number().int().min(0),
      rows: z.number().int().min(1),
    }),
    resamples: z.string(),
    rowKeys: z.string().nullable(),
  });
}

/**
 * The analyst's file as text, for the model file whose bytes have SHA-256
 * `modelSha256`.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { analystFromText, analystToText } from "./analyst_file.ts";
 * const model = {
 *   rows: { used: 2, dropped: 0 },
 *   ensemble: { trees: [{}], alpha: 0 },
 *   analyst: { resamples: Int32Array.of(1, 2, 3, 4), rowKeys: "AAAAAAAAAAA=BBBBBBBBBBB=" },
 *   provenance: { modelFile: { path: "m.json", sha256: "a".repeat(64) } },
 * } as unknown as import("./types.ts").Model;
 * const text = analystToText(model, "a".repeat(64));
 * assert.match(text, /never share it/);
 * assert.deepEqual(analystFromText(text, "m.analyst", model), model.analyst);
 * ```
 */
export function analystToText(model: Model, modelSha256: string): string {
  if (model.analyst === null) {
    throw new DataError("this model has no analyst's part to write (it was read from a file)");
  }
  const resamples = model.analyst.resamples;
  const body = {
    kind: MARKER,
    format: FORMAT,
    warning: ANALYST_FILE_WARNING,
    model: {
      sha256: modelSha256,
      trees: model.ensemble?.trees.length ?? 0,
      rows: model.rows.used,
    },
    resamples: arrayToBase64(resamples),
    rowKeys: model.analyst.rowKeys,
  };
  return withChecksum(body);
}

/**
 * Reads an analyst's file's text for `model` (read from the model file the
 * analyst's file names).
 *
 * @throws {DataError} when it is not an analyst's file, is damaged, or
 * belongs to another model file.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { analystFromText, analystToText } from "./analyst_file.ts";
 * const model = {
 *   rows: { used: 2, dropped: 0 },
 *   ensemble: { trees: [{}], alpha: 0 },
 *   analyst: { resamples: Int32Array.of(1, 2, 3, 4), rowKeys: "AAAAAAAAAAA=BBBBBBBBBBB=" },
 *   provenance: { modelFile: { path: "m.json", sha256: "a".repeat(64) } },
 * } as unknown as import("./types.ts").Model;
 * const text = analystToText(model, "a".repeat(64));
 * const part = analystFromText(text, "m.analyst", model);
 * assert.deepEqual([...part.resamples], [1, 2, 3, 4]);
 * assert.equal(part.rowKeys, "AAAAAAAAAAA=BBBBBBBBBBB=");
 * // Written for another model file's SHA-256, or edited, or not JSON: refused.
 * assert.throws(() => analystFromText(analystToText(model, "b".repeat(64)), "m.analyst", model), /belongs to another model file/);
 * assert.throws(() => analystFromText(text.replace("BBBB", "CCCC"), "m.analyst", model), /checksum does not match/);
 * assert.throws(() => analystFromText("{", "m.analyst", model), /not valid JSON/);
 * ```
 */
export function analystFromText(text: string, file: string, model: Model): AnalystPart {
  const damaged = (why: string) =>
    new DataError(`${file} is damaged or was edited: ${why}`, { file });
  let raw: unknown;
  try {
    raw = JSON.parse(text);
  } catch {
    throw new DataError(`${file} is not a paygrove analyst's file (not valid JSON)`, { file });
  }
  if (typeof raw !== "object" || raw === null || (raw as { kind?: unknown }).kind !== MARKER) {
    throw new DataError(`${file} is not a paygrove analyst's file`, { file });
  }
  const rest = withoutChecksum(raw);
  if (rest === null) throw damaged("its checksum does not match its contents");
  const parsed = fileShape().safeParse(rest);
  if (!parsed.success) {
    const issue = parsed.error.issues[0];
    throw damaged(`${issue.path.join(".") || "the document"}: ${issue.message}`);
  }
  const doc = parsed.data;
  const modelFile = model.provenance.modelFile;
  if (modelFile === undefined || modelFile.sha256 !== doc.model.sha256) {
    throw new DataError(
      `${file} belongs to another model file (SHA-256 ${doc.model.sha256.slice(0, 12)}...)` +
        (modelFile ? `, not to ${modelFile.path}` : ""),
      { file },
    );
  }
  const trees = model.ensemble?.trees.length ?? 0;
  if (doc.model.trees !== trees || doc.model.rows !== model.rows.used) {
    throw damaged("its counts of trees and rows are not the model's");
  }
  const resamples = arrayFromBase64(doc.resamples, Int32Array, trees * STATE_WORDS);
  if (typeof resamples === "string") {
    throw damaged(`its resampling states (${trees} trees) ${resamples}`);
  }
  if (doc.rowKeys !== null && doc.rowKeys.length !== 12 * model.rows.used) {
    throw damaged(`it has ${doc.rowKeys.length / 12} row keys for ${model.rows.used} rows`);
  }
  return { resamples, rowKeys: doc.rowKeys };
}

/**
 * Writes the analyst's file (mode 0600) for the model file just written
 * with SHA-256 `modelSha256`; an existing file is kept unless `force`.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { analystToText, writeAnalystFile } from "./analyst_file.ts";
 * const model = {
 *   rows: { used: 2, dropped: 0 },
 *   ensemble: { trees: [{}], alpha: 0 },
 *   analyst: { resamples: Int32Array.of(1, 2, 3, 4), rowKeys: "AAAAAAAAAAA=BBBBBBBBBBB=" },
 *   provenance: { modelFile: { path: "m.json", sha256: "a".repeat(64) } },
 * } as unknown as import("./types.ts").Model;
 * const path = `${Deno.makeTempDirSync()}/m.analyst`;
 * await writeAnalystFile(path, model, "a".repeat(64));
 * assert.equal(Deno.readTextFileSync(path), analystToText(model, "a".repeat(64)));
 * if (Deno.build.os !== "windows") assert.equal(Deno.statSync(path).mode! & 0o777, 0o600);
 * // Not over an existing file without force.
 * await assert.rejects(() => writeAnalystFile(path, model, "a".repeat(64)));
 * await writeAnalystFile(path, model, "a".repeat(64), { force: true });
 * ```
 */
export async function writeAnalystFile(
  path: string,
  model: Model,
  modelSha256: string,
  options: { force?: boolean; option?: string } = {},
): Promise<void> {
  await writeFileAtomic(path, analystToText(model, modelSha256), { ...options, private: true });
}

/**
 * Reads the analyst's file for `model` and joins it to the model.
 *
 * @throws {DataError} as {@linkcode analystFromText}.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { readAnalystFile, writeAnalystFile } from "./analyst_file.ts";
 * const model = {
 *   rows: { used: 2, dropped: 0 },
 *   ensemble: { trees: [{}], alpha: 0 },
 *   analyst: { resamples: Int32Array.of(1, 2, 3, 4), rowKeys: "AAAAAAAAAAA=BBBBBBBBBBB=" },
 *   provenance: { modelFile: { path: "m.json", sha256: "a".repeat(64) } },
 * } as unknown as import("./types.ts").Model;
 * const path = `${Deno.makeTempDirSync()}/m.analyst`;
 * await writeAnalystFile(path, model, "a".repeat(64));
 * // A model read from its shared file has no analyst's part; this joins it back.
 * const joined = await readAnalystFile(path, { ...model, analyst: null });
 * assert.deepEqual(joined.analyst, model.analyst);
 * assert.equal(joined.rows, model.rows);
 * ```
 */
export async function readAnalystFile(path: string, model: Model): Promise<Model> {
  // Row keys take 12 bytes a row, states 16 bytes a tree, in base64.
  const maxBytes = 4096 + 16 * (model.rows.used + 2 * (model.ensemble?.trees.length ?? 0) * 4);
  const text = await readTextBounded(path, { maxBytes, what: "analyst's file" });
  return { ...model, analyst: analystFromText(text, path, model) };
}
