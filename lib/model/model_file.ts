/**
 * The model file: one JSON document whose tree arrays are base64 of their
 * little-endian bytes (compact, and exact to the last bit), with a SHA-256
 * checksum of the rest. It is the shared part of a model: no one's pay and
 * nothing that with a staff list gives pay back (README, "What a model
 * file holds"); the analyst's part goes to its own file (analyst_file.ts).
 *
 * Reading checks, in order: the size (read in pieces, at most
 * {@linkcode MAX_MODEL_BYTES}) and that the text starts as a paygrove model;
 * that it is JSON of a format this version reads; the checksum; the
 * document's shape (zod); what its parts say of each other (features and
 * their levels, support figures, counts against the rows fitted on); and
 * every tree's structure (children after their parent and in range, at most
 * as many nodes as the rows allow, features and level masks in range,
 * finite numbers), so that a truncated, edited or foreign file gets a clear
 * message and a walk down a tree can never loop.
 *
 * @module
 */

import { createHash } from "node:crypto";
import { z } from "zod";
import { DataError } from "../errors.ts";
import type { FlatTree } from "../tree/flat_tree.ts";
import { VERSION } from "../version.ts";
import { writeFileAtomic } from "../io/atomic_write.ts";
import {
  arrayFromBase64,
  arrayToBase64,
  type StoredArray,
  withChecksum,
  withoutChecksum,
} from "../io/checked_json.ts";
import { readTextBounded } from "../io/read_bounded.ts";
import { legacyResampleStates } from "../ensemble/bootstrap.ts";
import { ATTRIBUTE_CEILING } from "../dataset/make_dataset.ts";
import { type Model, MODEL_FORMAT, type ModelFileNote } from "./types.ts";

/**
 * The largest model file read. No model paygrove writes comes near it (the
 * default CPS1988 model is 3.4 MB, unpruned 36 MB), and the JavaScript
 * engine's parser ran out of memory and stopped the process (not an error
 * paygrove can catch) on a 300 MB file of one long string; 200 MiB parses.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { readTextBounded } from "../io/read_bounded.ts";
 * import { MAX_MODEL_BYTES } from "./model_file.ts";
 * // The bound readModelFile reads to, as its message says it (a file of 200 MiB
 * // and more is not read here: the bound itself is shown with a small one).
 * const path = Deno.makeTempFileSync();
 * Deno.writeTextFileSync(path, "{}");
 * const read = await readTextBounded(path, { maxBytes: MAX_MODEL_BYTES, what: "model file" });
 * assert.equal(read, "{}");
 * assert.equal(MAX_MODEL_BYTES / 2 ** 20, 200);
 * Deno.removeSync(path);
 * ```
 */
export const MAX_MODEL_BYTES = 200 * 1024 * 1024;

/**
 * The largest size of a value on the fitting scale: log pay within +/-40
 * (e^40 is 2 x 10^17, beyond any pay), raw values within 10^15 (the pay
 * ceiling of lib/table/implausible.ts). A larger one is an edited file, and
 * would make an estimate or a chart overflow.
 */
const VALUE_BOUND = { log: 40, raw: 1e15 } as const;

/** The marker every paygrove model file starts with. */
const MARKER = "paygrove-model";

function toBase64(array: StoredArray): string {
  return arrayToBase64(array);
}

function fromBase64<T extends StoredArray>(
  text: string,
  Ctor: { new (buffer: ArrayBuffer): T; BYTES_PER_ELEMENT: number },
  length: number,
  what: string,
): T {
  const array = arrayFromBase64(text, Ctor, length);
  if (typeof array === "string") throw damaged(`${what} ${array}`);
  return array;
}

let currentFile = "model";
function damaged(detail: string): DataError {
  return new DataError(`${currentFile} is damaged or was edited: ${detail}`, { file: currentFile });
}

function encodeTree(tree: FlatTree) {
  return {
    task: tree.task,
    width: tree.width,
    nodeCount: tree.nodeCount,
    maskWords: Array.from(tree.maskWords),
    feature: toBase64(tree.feature),
    threshold: toBase64(tree.threshold),
    maskOffset: toBase64(tree.maskOffset),
    masks: toBase64(tree.masks),
    masksLength: tree.masks.length,
    left: toBase64(tree.left),
    right: toBase64(tree.right),
    missingLeft: toBase64(tree.missingLeft),
    value: toBase64(tree.value),
    // Training rows reaching each node (every row, drawn or not): what a
    // staff list and the tree give anyway. Node weights equal them (the
    // reference tree weighs every row 1; a shared ensemble tree's weights
    // are its covers) and node variances are never written.
    rows: toBase64(tree.rows),
  };
}

// The file's schemas, declared on the first read: zod builds a schema's
// objects as it is declared, which took 0.03 s of every command's start-up
// (with the analyst file's), and most commands never read a model file.
function declareShapes() {
  const treeShape = z.object({
    task: z.enum(["regression", "classification"]),
    width: z.number().int().min(1),
    nodeCount: z.number().int().min(1),
    maskWords: z.array(z.number().int().min(0)),
    feature: z.string(),
    threshold: z.string(),
    maskOffset: z.string(),
    masks: z.string(),
    masksLength: z.number().int().min(0),
    left: z.string(),
    right: z.string(),
    missingLeft: z.string(),
    value: z.string(),
    rows: z.string(),
    weight: z.string().optional(),
    impurity: z.string().optional(),
  });

  const finite = z.number().refine(Number.isFinite, "must be a finite number");
  const maybeNumber = z.union([z.number(), z.null()]).transform((v) => (v === null ? NaN : v));
  const metrics = z.object({ rmse: maybeNumber, mae: maybeNumber, r2: maybeNumber });
  // Keys in the order fitModel writes them, so a reloaded model saves to the
  // same text.
  const accuracy = z.object({
    measuredBy: z.enum(["cross-validation", "out-of-bag", "in-sample"]),
    money: metrics.optional(),
    rmseSe: maybeNumber.optional(),
    log: metrics.optional(),
    accuracy: maybeNumber.optional(),
    classes: z.object({
      precision: z.array(maybeNumber),
      recall: z.array(maybeNumber),
      confusion: z.array(z.array(z.number())),
    }).optional(),
    aliased: z.array(z.object({
      term: z.discriminatedUnion("kind", [
        z.object({ feature: z.string(), kind: z.literal("value") }),
        z.object({ feature: z.string(), kind: z.literal("missing") }),
        z.object({ feature: z.string(), kind: z.literal("level"), level: z.string().nullable() }),
      ]),
      folds: z.number().int().min(1),
    })).optional(),
  });
  const moneyUnit = z.object({
    // An ISO 4217 code: anything else makes the number formatter throw.
    currency: z.string().regex(/^[A-Z]{3}$/, "must be a currency code such as EUR").optional(),
    period: z.enum(["hour", "week", "month", "year"]).optional(),
  });

  const documentShape = z.object({
    kind: z.literal(MARKER),
    format: z.number().int(),
    provenance: z.object({
      paygrove: z.string(),
      format: z.number().int(),
      created: z.string(),
      table: z.object({ file: z.string(), sha256: z.string(), rows: z.number().int() }),
      seed: z.number(),
    }),
    target: z.object({
      name: z.string(),
      kind: z.enum(["regression", "classification"]),
      classes: z.array(z.string()).optional(),
      money: moneyUnit.optional(),
      scale: z.enum(["log", "raw"]),
      center: z.object({
        shift: z.number().min(-10).max(10),
        duan: z.number().positive().max(1e6),
        meanOverEstimate: z.number().positive().max(1e6),
        rows: z.number().int().min(0),
      }).optional(),
    }),
    features: z.array(z.object({
      name: z.string(),
      kind: z.enum(["numeric", "ordinal", "categorical"]),
      levels: z.array(z.string()).optional(),
      typical: maybeNumber,
      range: z.object({ min: maybeNumber, max: maybeNumber, p01: maybeNumber, p99: maybeNumber })
        .optional(),
      missing: z.number().int().min(0),
      protected: z.boolean(),
    })).min(1),
    dropped: z.array(z.object({ name: z.string(), reason: z.string() })),
    read: z.object({
      delimiter: z.string().optional(),
      decimal: z.enum([".", ","]),
      encoding: z.string(),
      missing: z.array(z.string()).optional(),
      types: z.record(z.string(), z.enum(["numeric", "categorical", "ordinal", "identifier"])),
      orders: z.record(z.string(), z.array(z.string())),
      currency: z.string().optional(),
      hoursPerYear: z.number().optional(),
      fte: z.string().optional(),
      periods: z.record(z.string(), z.enum(["hour", "week", "month", "year"])).optional(),
      protected: z.array(z.string()).optional(),
      identifier: z.string().optional(),
    }),
    settings: z.object({
      trees: z.number().int().min(0),
      minLeaf: z.number().int().min(1),
      folds: z.number().int().min(2),
      rule: z.enum(["one-se", "min"]),
      prune: z.enum(["alpha-min", "none"]),
      seed: z.number(),
      privacyMin: z.number().int().min(3),
      where: z.record(z.string(), z.array(z.string())),
      allowProtected: z.boolean(),
      // Files written before the constraint existed hold none.
      increasing: z.array(z.string()).default([]),
    }),
    rows: z.object({ used: z.number().int().min(1), dropped: z.number().int().min(0) }),
    reference: z.object({
      tree: treeShape,
      alpha: finite,
      leaves: z.number().int().min(1),
      depth: z.number().int().min(0),
      pruningPath: z.array(z.object({
        alpha: finite,
        leaves: z.number().int(),
        risk: finite,
        cvError: finite,
        cvSe: finite,
      })),
    }),
    ensemble: z.object({
      trees: z.array(treeShape),
      // Format 1 only: each tree's resampling seed.
      seeds: z.string().optional(),
      alpha: finite,
    }).nullable(),
    residuals: z.object({ edges: z.array(maybeNumber), quantiles: z.array(z.string()) }).nullable(),
    quality: z.object({
      constantInSample: accuracy,
      constant: accuracy,
      linear: accuracy.nullable(),
      reference: accuracy,
      ensemble: accuracy.nullable(),
    }),
    importance: z.array(z.object({
      feature: z.string(),
      permutation: maybeNumber,
      permutationSd: maybeNumber,
      impurity: maybeNumber,
    })),
    proxies: z.array(z.object({
      feature: z.string(),
      attribute: z.string(),
      balancedAccuracy: z.number().min(0).max(1),
    })).optional(),
    support: z.object({
      peers: z.object({
        features: z.tuple([z.string(), z.string()]),
        counts: z.record(z.string(), z.number().int()),
      }).nullable(),
      levelRanges: z.array(z.object({
        feature: z.string(),
        level: z.string(),
        ranges: z.array(z.object({ feature: z.string(), p01: finite, p99: finite })),
      })),
    }),
    // Format 1 only: the training rows' keys.
    rowKeys: z.string().nullable().optional(),
    seconds: z.number(),
  });
  return { treeShape, documentShape };
}

let shapes: ReturnType<typeof declareShapes> | undefined;
const fileShapes = () => shapes ??= declareShapes();
type TreeShape = z.infer<ReturnType<typeof declareShapes>["treeShape"]>;
type DocumentShape = z.infer<ReturnType<typeof declareShapes>["documentShape"]>;

/** Steps of a residual group's quantile grid (201 points: 0, 0.005, ..., 1). */
const GRID = 201;

/**
 * The model as the file's text (compact JSON with a checksum): the shared
 * part only; the analyst's part is never written here.
 *
 * @throws {DataError} for a model read from a format-1 file, whose trees
 * carry traces of their resamples (refit it instead).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { demoCompanyCsv, fitModel, loadTable, modelFromText, modelToText } from "../../mod.ts";
 * const table = loadTable(demoCompanyCsv({ rows: 200, seed: 2 }), { target: "base_pay_eur" });
 * const model = await fitModel(table, { target: "base_pay_eur", trees: 5, folds: 4, workers: 1 });
 * const again = modelFromText(modelToText(model), "m.json");
 * assert.deepEqual(again.ensemble!.trees[3].value, model.ensemble!.trees[3].value);
 * ```
 */
export function modelToText(model: Model): string {
  if (model.fileNotes?.some((n) => n.kind === "rebuildsPay")) {
    throw new DataError(
      "a model read from a format-1 file cannot be saved again: its trees keep traces of " +
        "their resamples; fit the model again from its table",
    );
  }
  const body = {
    kind: MARKER,
    format: MODEL_FORMAT,
    provenance: { ...model.provenance, modelFile: undefined },
    target: model.target,
    features: model.features,
    dropped: model.dropped,
    read: model.read,
    settings: model.settings,
    rows: model.rows,
    reference: { ...model.reference, tree: encodeTree(model.reference.tree) },
    ensemble: model.ensemble === null ? null : {
      trees: model.ensemble.trees.map(encodeTree),
      alpha: model.ensemble.alpha,
    },
    residuals: model.residuals === null ? null : {
      edges: Array.from(model.residuals.edges, (e) => (Number.isFinite(e) ? e : null)),
      quantiles: model.residuals.residuals.map((q) => toBase64(Float64Array.from(q))),
    },
    quality: model.quality,
    importance: model.importance,
    ...(model.proxies ? { proxies: model.proxies } : {}),
    support: model.support,
    seconds: model.seconds,
  };
  // NaN is not JSON: it is written as null and read back as NaN.
  return withChecksum(body);
}

/**
 * Reads a model from its file's text, checking everything listed in the
 * module notes.
 *
 * @param file The file's name, for messages.
 * @throws {DataError} naming what is wrong.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { demoCompanyCsv, fitModel, loadTable } from "../../mod.ts";
 * import { modelFromText, modelToText } from "./model_file.ts";
 * const table = loadTable(demoCompanyCsv({ rows: 200, seed: 4 }), { target: "base_pay_eur" });
 * const model = await fitModel(table, { target: "base_pay_eur", trees: 6, folds: 5, workers: 1 });
 * const text = modelToText(model);
 * const read = modelFromText(text, "m.json");
 * assert.deepEqual(read.features.map((f) => f.name), model.features.map((f) => f.name));
 * assert.deepEqual(read.rows, { used: 200, dropped: 0 });
 * assert.equal(read.ensemble!.trees.length, 6);
 * assert.equal(read.analyst, null); // the shared file holds no resampling states
 * assert.throws(() => modelFromText(text.slice(0, 100), "m.json"), /not valid JSON/);
 * ```
 */
export function modelFromText(text: string, file: string): Model {
  currentFile = file;
  let raw: unknown;
  try {
    raw = JSON.parse(text);
  } catch {
    throw new DataError(
      `${file} is not a complete paygrove model: it is not valid JSON (cut short, or not a model file)`,
      { file },
    );
  }
  if (typeof raw !== "object" || raw === null || (raw as { kind?: unknown }).kind !== MARKER) {
    throw new DataError(`${file} is not a paygrove model file`, { file });
  }
  const format = (raw as { format?: unknown }).format;
  if (typeof format !== "number" || !Number.isInteger(format) || format < 1) {
    throw new DataError(`${file} is not a paygrove model file (its format is not a number)`, {
      file,
    });
  }
  if (format > MODEL_FORMAT) {
    throw new DataError(
      `${file} was written in model format ${format} by a newer paygrove; this paygrove ` +
        `(${VERSION}) reads format ${MODEL_FORMAT}. Refit the model or upgrade paygrove`,
      { file },
    );
  }
  const rest = withoutChecksum(raw);
  if (rest === null) throw damaged("its checksum does not match its contents");
  const parsed = fileShapes().documentShape.safeParse(rest);
  if (!parsed.success) {
    const issue = parsed.error.issues[0];
    throw damaged(`${issue.path.join(".") || "the document"}: ${issue.message}`);
  }
  const doc = parsed.data;
  checkParts(doc);
  const features = doc.features.length;
  const maskWords = doc.features.map((f) =>
    f.kind === "categorical" ? Math.ceil((f.levels?.length ?? 0) / 32) : 0
  );
  const width = doc.target.kind === "regression" ? 1 : (doc.target.classes?.length ?? 0);
  // Class shares lie in [0, 1]; regression values within the scale's bound.
  const bound = doc.target.kind === "regression" ? VALUE_BOUND[doc.target.scale] : 1;
  // A tree's leaves each hold at least the minimum leaf of the rows it was
  // fitted on, so it has at most this many nodes; a larger count is an
  // edited file (and would make every walk slow).
  const leavesAtMost = Math.max(1, Math.floor(doc.rows.used / doc.settings.minLeaf));
  const nodesAtMost = 2 * leavesAtMost - 1;
  const decodeTree = (shape: TreeShape, where: string): FlatTree => {
    const n = shape.nodeCount;
    if (shape.width !== width) {
      throw damaged(`${where} has width ${shape.width}, expected ${width}`);
    }
    if (shape.maskWords.length !== features || shape.maskWords.some((w, f) => w !== maskWords[f])) {
      throw damaged(`${where} does not match the model's features`);
    }
    if (n > nodesAtMost) {
      throw damaged(
        `${where} has ${n} nodes; a tree of ${doc.rows.used} rows with leaves of at least ` +
          `${doc.settings.minLeaf} has at most ${nodesAtMost}`,
      );
    }
    const rows = fromBase64(shape.rows, Int32Array, n, `${where}.rows`);
    const tree: FlatTree = {
      task: shape.task,
      width: shape.width,
      nodeCount: n,
      maskWords: Int32Array.from(shape.maskWords),
      feature: fromBase64(shape.feature, Int32Array, n, `${where}.feature`),
      threshold: fromBase64(shape.threshold, Float64Array, n, `${where}.threshold`),
      maskOffset: fromBase64(shape.maskOffset, Int32Array, n, `${where}.maskOffset`),
      masks: fromBase64(shape.masks, Uint32Array, shape.masksLength, `${where}.masks`),
      left: fromBase64(shape.left, Int32Array, n, `${where}.left`),
      right: fromBase64(shape.right, Int32Array, n, `${where}.right`),
      missingLeft: fromBase64(shape.missingLeft, Uint8Array, n, `${where}.missingLeft`),
      value: fromBase64(shape.value, Float64Array, n * width, `${where}.value`),
      rows,
      // Not in the file (format 1's are not carried over either): weights
      // equal the row counts, variances are not kept.
      weight: Float64Array.from(rows),
      impurity: new Float64Array(n).fill(NaN),
    };
    checkTree(tree, doc.features, where, bound);
    return tree;
  };
  const reference = decodeTree(doc.reference.tree, "reference tree");
  let ensemble: Model["ensemble"] = null;
  let analyst: Model["analyst"] = null;
  const fileNotes: ModelFileNote[] = [];
  if (doc.ensemble !== null) {
    const trees = doc.ensemble.trees.map((t, b) => decodeTree(t, `tree ${b + 1}`));
    if (trees.length !== doc.settings.trees || trees.length === 0) {
      throw damaged(`it has ${trees.length} trees, its settings say ${doc.settings.trees}`);
    }
    ensemble = { trees, alpha: doc.ensemble.alpha };
  } else if (doc.settings.trees !== 0) {
    throw damaged(`it has no trees, its settings say ${doc.settings.trees}`);
  }
  if (doc.format === 1) {
    // Format 1 kept what rebuilds pay; it is read, said, and never written
    // again (modelToText refuses such a model).
    fileNotes.push({ kind: "rebuildsPay", format: 1 });
    const keys = doc.rowKeys ?? null;
    if (keys !== null && keys.length !== 12 * doc.rows.used) {
      throw damaged(`it has ${keys.length / 12} row keys for ${doc.rows.used} rows`);
    }
    analyst = {
      resamples: doc.ensemble?.seeds === undefined ? new Int32Array(0) : legacyResampleStates(
        fromBase64(doc.ensemble.seeds, Int32Array, doc.ensemble.trees.length, "seeds"),
      ),
      rowKeys: keys,
    };
  }
  let residuals: Model["residuals"] = null;
  if (doc.residuals !== null) {
    const groups = doc.residuals.quantiles.length;
    if (groups === 0 || doc.residuals.edges.length !== groups) {
      throw damaged("its residual groups are inconsistent");
    }
    residuals = {
      edges: Float64Array.from(doc.residuals.edges, (e, g) => (g === groups - 1 ? Infinity : e)),
      residuals: doc.residuals.quantiles.map((q, g) => {
        const grid = fromBase64(q, Float64Array, GRID, `residual group ${g + 1}`);
        for (let k = 1; k < GRID; k++) {
          if (!(grid[k] >= grid[k - 1])) throw damaged(`residual group ${g + 1} is not sorted`);
        }
        if (!(Math.abs(grid[0]) <= bound && Math.abs(grid[GRID - 1]) <= bound)) {
          throw damaged(`residual group ${g + 1} reaches beyond ${bound}`);
        }
        return grid;
      }),
    };
  }
  return {
    provenance: doc.provenance,
    target: doc.target,
    features: doc.features,
    dropped: doc.dropped,
    read: doc.read,
    settings: doc.settings,
    rows: doc.rows,
    reference: { ...doc.reference, tree: reference },
    ensemble,
    residuals,
    quality: doc.quality,
    importance: doc.importance,
    ...(doc.proxies ? { proxies: doc.proxies } : {}),
    support: doc.support,
    analyst,
    ...(fileNotes.length > 0 ? { fileNotes } : {}),
    seconds: doc.seconds,
  } as Model;
}

// What the document's parts say of each other: level features have levels
// and a typical level among them, a classification target its classes,
// importance and support figures name the model's own features and levels,
// and the row counts add up to the table's.
function checkParts(doc: DocumentShape): void {
  const byName = new Map(doc.features.map((f) => [f.name, f]));
  if (byName.size !== doc.features.length) throw damaged("two features have the same name");
  for (const f of doc.features) {
    if (f.kind === "numeric") {
      if (f.levels !== undefined) throw damaged(`feature ${f.name} is numeric but has levels`);
      // The numbers an attribute may hold (lib/dataset/make_dataset.ts).
      const figures = [f.typical, ...Object.values(f.range ?? {})];
      if (figures.some((x) => Math.abs(x) > ATTRIBUTE_CEILING)) {
        throw damaged(`feature ${f.name} has a range beyond 10^15`);
      }
      continue;
    }
    const levels = f.levels ?? [];
    if (levels.length === 0) throw damaged(`feature ${f.name} is ${f.kind} but has no levels`);
    if (
      !Number.isNaN(f.typical) &&
      !(Number.isInteger(f.typical) && f.typical >= 0 && f.typical < levels.length)
    ) {
      throw damaged(`feature ${f.name} has no level ${f.typical}`);
    }
    // Two levels of one name would make a profile's level ambiguous.
    if (new Set(levels).size !== levels.length) {
      throw damaged(`feature ${f.name} names a level twice`);
    }
  }
  if (doc.target.kind === "classification" && (doc.target.classes?.length ?? 0) < 2) {
    throw damaged("its class target has fewer than two classes");
  }
  const classes = doc.target.classes ?? [];
  if (new Set(classes).size !== classes.length) {
    throw damaged("its class target names a class twice");
  }
  if (doc.importance.some((i) => !byName.has(i.feature))) {
    throw damaged("its importance names a feature the model does not have");
  }
  const peers = doc.support.peers;
  if (peers !== null) {
    for (const name of peers.features) {
      const f = byName.get(name);
      if (f === undefined || f.kind === "numeric") {
        throw damaged(`its support figures name ${name}, not a level feature of the model`);
      }
    }
  }
  for (const group of doc.support.levelRanges) {
    if (
      group.ranges.some((r) =>
        Math.abs(r.p01) > ATTRIBUTE_CEILING || Math.abs(r.p99) > ATTRIBUTE_CEILING
      )
    ) {
      throw damaged(`its support figures hold a number beyond 10^15`);
    }
    const f = byName.get(group.feature);
    if (f === undefined || !(f.levels ?? []).includes(group.level)) {
      throw damaged(`its support figures name ${group.feature} ${group.level}, which it lacks`);
    }
    if (group.ranges.some((r) => byName.get(r.feature)?.kind !== "numeric")) {
      throw damaged(`its support figures name a numeric feature the model does not have`);
    }
  }
  if (doc.rows.used + doc.rows.dropped !== doc.provenance.table.rows) {
    throw damaged(
      `it was fitted on ${doc.rows.used} rows with ${doc.rows.dropped} left out, but its ` +
        `table had ${doc.provenance.table.rows}`,
    );
  }
}

// Every node's children come after it and within the tree, so a walk from
// the root only moves forward and ends; every node has at most one parent
// and at least one person; splits name real features, finite
// thresholds (Infinity splits known from missing) or level masks within the
// mask array; values are finite.
function checkTree(
  tree: FlatTree,
  features: { kind: string; levels?: string[] }[],
  where: string,
  bound: number,
): void {
  // Each node below the root is one split's child: a node reached from two
  // splits would make the paths from the root grow exponentially in number.
  const parents = new Uint8Array(tree.nodeCount);
  for (let i = 0; i < tree.nodeCount; i++) {
    const l = tree.left[i];
    const r = tree.right[i];
    const f = tree.feature[i];
    // Every node holds people: its count divides its children's shares.
    if (!(tree.rows[i] >= 1)) throw damaged(`${where}: node ${i} holds no people`);
    for (let c = 0; c < tree.width; c++) {
      const v = tree.value[i * tree.width + c];
      if (!Number.isFinite(v)) throw damaged(`${where}: node ${i} has no finite value`);
      if (!(Math.abs(v) <= bound)) {
        throw damaged(`${where}: node ${i} has the value ${v}, beyond ${bound}`);
      }
    }
    if (l === -1 && r === -1 && f === -1) continue;
    if (!(l > i && r > i && l < tree.nodeCount && r < tree.nodeCount && l !== r)) {
      throw damaged(
        `${where}: node ${i} has children ${l} and ${r}, which are out of order or range`,
      );
    }
    if (parents[l]++ > 0 || parents[r]++ > 0) {
      throw damaged(
        `${where}: node ${l === r ? l : parents[l] > 1 ? l : r} is a child of two splits`,
      );
    }
    if (!(f >= 0 && f < features.length)) {
      throw damaged(`${where}: node ${i} splits on feature ${f}, which does not exist`);
    }
    if (features[f].kind === "categorical") {
      const off = tree.maskOffset[i];
      if (!(off >= 0 && off + 2 * tree.maskWords[f] <= tree.masks.length)) {
        throw damaged(`${where}: node ${i}'s level sets are out of range`);
      }
    } else if (Number.isNaN(tree.threshold[i])) {
      // Infinity is a real threshold: the split of known against missing values.
      throw damaged(`${where}: node ${i} has no threshold`);
    }
  }
}

/**
 * Reads and checks a model file, in pieces and at most
 * {@linkcode MAX_MODEL_BYTES}: a device, a stream or anything that does not
 * start as JSON is refused at its first piece, before it is all read.
 *
 * @throws {DataError} when it cannot be read or is not a sound model.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { readModelFile } from "./model_file.ts";
 * const path = Deno.makeTempFileSync();
 * Deno.writeTextFileSync(path, "employee_id,pay\n1,50\n");
 * await assert.rejects(() => readModelFile(path), /is not a paygrove model file/);
 * ```
 */
export async function readModelFile(path: string): Promise<Model> {
  const text = await readTextBounded(path, { maxBytes: MAX_MODEL_BYTES, what: "model file" });
  const model = modelFromText(text, path);
  model.provenance.modelFile = {
    path,
    sha256: createHash("sha256").update(text).digest("hex"),
  };
  return model;
}

/**
 * Writes a model file atomically; an existing file is kept unless `force`.
 *
 * @returns The file's size in bytes and the SHA-256 of its bytes.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { createHash } from "node:crypto";
 * import { demoCompanyCsv, fitModel, loadTable } from "../../mod.ts";
 * import { readModelFile, writeModelFile } from "./model_file.ts";
 * const table = loadTable(demoCompanyCsv({ rows: 200, seed: 4 }), { target: "base_pay_eur" });
 * const model = await fitModel(table, { target: "base_pay_eur", trees: 6, folds: 5, workers: 1 });
 * const path = `${Deno.makeTempDirSync()}/m.json`;
 * const written = await writeModelFile(path, model);
 * const bytes = Deno.readFileSync(path);
 * assert.equal(written.bytes, bytes.length);
 * assert.equal(written.sha256, createHash("sha256").update(bytes).digest("hex"));
 * assert.equal((await readModelFile(path)).provenance.modelFile!.sha256, written.sha256);
 * // Not over an existing file without force.
 * await assert.rejects(() => writeModelFile(path, model));
 * ```
 */
export async function writeModelFile(
  path: string,
  model: Model,
  force = false,
  option = "out",
): Promise<{ bytes: number; sha256: string }> {
  const text = modelToText(model);
  await writeFileAtomic(path, text, { force, option });
  return {
    bytes: new TextEncoder().encode(text).length,
    sha256: createHash("sha256").update(text).digest("hex"),
  };
}
