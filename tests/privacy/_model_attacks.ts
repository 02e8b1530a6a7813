/**
 * The attacks on a shared model file, written as an outsider would write
 * them: the file is read as the JSON it is (its arrays decoded from base64
 * here, not by paygrove's reader), the roster (a staff list with every
 * attribute but no pay) is encoded by the file's own schema, and every
 * tree is walked by code of this module. Each attack returns a guess of
 * every roster person's pay on the file's fitting scale; the test scores
 * them against the true pay and against what the model itself says.
 *
 * The attacks:
 * - (a) every leaf mean as a linear equation in the unknown pays, with the
 *   in-bag weights of every tree that an attacker can derive from the file
 *   (stored seeds; the seed in the settings put through the resampler; and
 *   zeros for rows a split's threshold or level sets show were not drawn),
 *   weights of 1 where nothing is derivable;
 * - (b) the same system with every weight guessed at 1, solved by least
 *   squares to convergence;
 * - (c) what the stored node counts, node variances and residual grids add
 *   to (b);
 * - (d) the baseline: the file's own estimate for each roster row;
 * - (e) beyond the list: (b) stopped after a few iterations (a
 *   smoothed solve), the best stop chosen with the true pay in hand, so it
 *   is stronger than any attacker could be.
 *
 * @module
 */

import { uniformInt } from "pure-rand/distribution/uniformInt";
import { xoroshiro128plus } from "pure-rand/generator/xoroshiro128plus";
import { rowKey } from "../../mod.ts";

// The resampler of format-1 files, written again here as an attacker would
// (pure-rand's xoroshiro128+ from a 32-bit seed, one uniform draw per row).
function legacyCounts(rows: number, seed: number): Float64Array {
  const rng = xoroshiro128plus(seed);
  const counts = new Float64Array(rows);
  for (let i = 0; i < rows; i++) counts[uniformInt(rng, 0, rows - 1)]++;
  return counts;
}

/** One tree as the file stores it. */
export interface FileTree {
  nodes: number;
  width: number;
  feature: Int32Array;
  threshold: Float64Array;
  maskOffset: Int32Array;
  masks: Uint32Array;
  maskWords: number[];
  left: Int32Array;
  right: Int32Array;
  missingLeft: Uint8Array;
  value: Float64Array;
  rows: Int32Array | null;
  impurity: Float64Array | null;
}

/** What the attacker reads out of the file. */
export interface FileContents {
  format: number;
  features: { name: string; kind: string; levels?: string[] }[];
  target: string;
  seed: number | null;
  minLeaf: number;
  rowsUsed: number;
  identifier: string | null;
  trees: FileTree[];
  reference: FileTree;
  /** Stored per-tree seeds (format 1). */
  seeds: Int32Array | null;
  /** Stored row keys (format 1). */
  rowKeys: string | null;
  residuals: { edges: number[]; grids: Float64Array[] } | null;
}

function bytesOf(base64: string): Uint8Array {
  const binary = atob(base64);
  const out = new Uint8Array(binary.length);
  for (let i = 0; i < binary.length; i++) out[i] = binary.charCodeAt(i);
  return out;
}
function f64(b: string) {
  const bytes = bytesOf(b);
  return new Float64Array(bytes.buffer, 0, bytes.length / 8);
}
function i32(b: string) {
  const bytes = bytesOf(b);
  return new Int32Array(bytes.buffer, 0, bytes.length / 4);
}

// deno-lint-ignore no-explicit-any
function treeOf(t: any): FileTree {
  return {
    nodes: t.nodeCount,
    width: t.width,
    feature: i32(t.feature),
    threshold: f64(t.threshold),
    maskOffset: i32(t.maskOffset),
    masks: new Uint32Array(bytesOf(t.masks).buffer),
    maskWords: t.maskWords,
    left: i32(t.left),
    right: i32(t.right),
    missingLeft: bytesOf(t.missingLeft),
    value: f64(t.value),
    rows: typeof t.rows === "string"
      ? i32(t.rows)
      : typeof t.cover === "string"
      ? i32(t.cover)
      : null,
    impurity: typeof t.impurity === "string" ? f64(t.impurity) : null,
  };
}

/** Reads a model file's text as the attacker does. */
export function readFile(text: string): FileContents {
  const doc = JSON.parse(text);
  const ensemble = doc.ensemble;
  return {
    format: doc.format,
    features: doc.features,
    target: doc.target.name,
    seed: typeof doc.settings?.seed === "number" ? doc.settings.seed : null,
    minLeaf: doc.settings.minLeaf,
    rowsUsed: doc.rows.used,
    identifier: doc.read?.identifier ?? null,
    trees: ensemble === null ? [] : ensemble.trees.map(treeOf),
    reference: treeOf(doc.reference.tree),
    seeds: ensemble !== null && typeof ensemble.seeds === "string" ? i32(ensemble.seeds) : null,
    rowKeys: typeof doc.rowKeys === "string" ? doc.rowKeys : null,
    residuals: doc.residuals === null || doc.residuals === undefined ? null : {
      edges: doc.residuals.edges.map((e: number | null) => e ?? Infinity),
      grids: doc.residuals.quantiles.map(f64),
    },
  };
}

/** A roster encoded by the file's schema: one profile per person. */
export interface Roster {
  ids: string[];
  profiles: Float64Array[];
}

/**
 * Encodes a roster CSV (a simple export: no quoted fields) by the file's
 * feature list: numbers as numbers, levels as their index, blanks missing.
 */
export function encodeRoster(file: FileContents, csv: string): Roster {
  const [head, ...lines] = csv.trim().split("\n");
  const header = head.split(",");
  const at = file.features.map((f) => header.indexOf(f.name));
  const idAt = file.identifier === null ? -1 : header.indexOf(file.identifier);
  const ids: string[] = [];
  const profiles = lines.map((line) => {
    const cells = line.split(",");
    ids.push(idAt < 0 ? "" : cells[idAt]);
    return Float64Array.from(file.features, (f, g) => {
      const cell = cells[at[g]];
      if (cell === "" || cell === undefined) return NaN;
      return f.kind === "numeric" ? Number(cell) : f.levels!.indexOf(cell);
    });
  });
  return { ids, profiles };
}

function goesLeft(t: FileTree, node: number, x: number): boolean {
  if (Number.isNaN(x)) return t.missingLeft[node] === 1;
  const off = t.maskOffset[node];
  if (off < 0) return x <= t.threshold[node];
  const words = t.maskWords[t.feature[node]];
  if (((t.masks[off + (x >>> 5)] >>> (x & 31)) & 1) === 1) return true;
  if (((t.masks[off + words + (x >>> 5)] >>> (x & 31)) & 1) === 1) return false;
  return t.missingLeft[node] === 1;
}

/** The nodes a profile passes through, root to leaf. */
function pathOf(t: FileTree, x: Float64Array): number[] {
  const path = [0];
  let node = 0;
  while (t.left[node] !== -1) {
    node = goesLeft(t, node, x[t.feature[node]]) ? t.left[node] : t.right[node];
    path.push(node);
  }
  return path;
}

/** Every roster person's path through every tree. */
export function pathsOf(trees: FileTree[], roster: Roster): number[][][] {
  return trees.map((t) => roster.profiles.map((x) => pathOf(t, x)));
}

/** (d): the file's own estimate of each person (mean of the trees' leaves). */
export function baseline(file: FileContents, paths: number[][][]): Float64Array {
  const n = paths[0].length;
  const out = new Float64Array(n);
  file.trees.forEach((t, b) => {
    for (let i = 0; i < n; i++) {
      const p = paths[b][i];
      out[i] += t.value[p[p.length - 1]] / file.trees.length;
    }
  });
  return out;
}

/** A sparse system: rows of weights summing to 1 over roster people. */
export interface System {
  ptr: number[];
  idx: number[];
  w: number[];
  rhs: number[];
  scale: number[];
}

function emptySystem(): System {
  return { ptr: [0], idx: [], w: [], rhs: [], scale: [] };
}

function addEquation(s: System, members: number[], weights: number[], value: number, scale = 1) {
  let total = 0;
  for (const w of weights) total += w;
  if (!(total > 0)) return;
  members.forEach((m, k) => {
    if (weights[k] === 0) return;
    s.idx.push(m);
    s.w.push(weights[k] / total);
  });
  s.rhs.push(value);
  s.scale.push(scale);
  s.ptr.push(s.idx.length);
}

/**
 * The leaf-mean equations of every tree (and, with `internal`, of every
 * internal node too), each person weighted by `weightOf(tree, person)`;
 * the reference tree's leaves (every row weight 1) join with weight 1.
 */
export function equations(
  file: FileContents,
  paths: number[][][],
  refPaths: number[][],
  weightOf: (b: number, i: number) => number,
  options: { internal?: boolean; reliability?: (b: number, node: number) => number } = {},
): System {
  const s = emptySystem();
  const n = refPaths.length;
  file.trees.forEach((t, b) => {
    const members: number[][] = Array.from({ length: t.nodes }, () => []);
    for (let i = 0; i < n; i++) {
      const p = paths[b][i];
      if (options.internal) { for (const node of p) members[node].push(i); }
      else members[p[p.length - 1]].push(i);
    }
    for (let node = 0; node < t.nodes; node++) {
      const m = members[node];
      if (m.length === 0) continue;
      addEquation(
        s,
        m,
        m.map((i) => weightOf(b, i)),
        t.value[node],
        options.reliability?.(b, node) ?? 1,
      );
    }
  });
  const ref = file.reference;
  const leafMembers: number[][] = Array.from({ length: ref.nodes }, () => []);
  refPaths.forEach((p, i) => leafMembers[p[p.length - 1]].push(i));
  leafMembers.forEach((m, node) => {
    if (m.length > 0) addEquation(s, m, m.map(() => 1), ref.value[node]);
  });
  return s;
}

/**
 * Conjugate gradients on the normal equations (CGLS), from `start`, with
 * each equation scaled by its reliability; calls `at` after the listed
 * iterations with the current solution.
 */
export function solve(
  s: System,
  start: Float64Array,
  iterations: number,
  at: (k: number, x: Float64Array) => void = () => {},
  stops: readonly number[] = [],
): Float64Array {
  const n = start.length;
  const m = s.rhs.length;
  const ptr = Int32Array.from(s.ptr);
  const idx = Int32Array.from(s.idx);
  const w = Float64Array.from(s.w);
  for (let e = 0; e < m; e++) {
    for (let j = ptr[e]; j < ptr[e + 1]; j++) w[j] *= s.scale[e];
  }
  const rhs = Float64Array.from(s.rhs, (v, e) => v * s.scale[e]);
  const mul = (v: Float64Array, out: Float64Array) => {
    for (let e = 0; e < m; e++) {
      let sum = 0;
      for (let j = ptr[e]; j < ptr[e + 1]; j++) sum += w[j] * v[idx[j]];
      out[e] = sum;
    }
  };
  const mulT = (u: Float64Array, out: Float64Array) => {
    out.fill(0);
    for (let e = 0; e < m; e++) {
      const ue = u[e];
      for (let j = ptr[e]; j < ptr[e + 1]; j++) out[idx[j]] += w[j] * ue;
    }
  };
  const dot = (a: Float64Array, b: Float64Array) => {
    let sum = 0;
    for (let i = 0; i < a.length; i++) sum += a[i] * b[i];
    return sum;
  };
  const x = Float64Array.from(start);
  const r = new Float64Array(m);
  const q = new Float64Array(m);
  mul(x, r);
  for (let e = 0; e < m; e++) r[e] = rhs[e] - r[e];
  const g = new Float64Array(n);
  mulT(r, g);
  const p = Float64Array.from(g);
  let gamma = dot(g, g);
  const first = gamma;
  for (let k = 1; k <= iterations; k++) {
    if (gamma <= 1e-28 * first) break;
    mul(p, q);
    const alpha = gamma / dot(q, q);
    for (let i = 0; i < n; i++) x[i] += alpha * p[i];
    for (let e = 0; e < m; e++) r[e] -= alpha * q[e];
    mulT(r, g);
    const next = dot(g, g);
    const beta = next / gamma;
    gamma = next;
    for (let i = 0; i < n; i++) p[i] = g[i] + beta * p[i];
    if (stops.includes(k)) at(k, x);
  }
  return x;
}

/** How close a guess of pay (fitting scale) comes to the truth (money). */
export interface Recovery {
  /** Share of people whose pay the guess has within 1%. */
  within1: number;
  /** Share within 0.01% (pay to the euro or better). */
  exact: number;
  /** Median absolute error in money. */
  medianError: number;
}

/** Scores a guess; `toMoney` undoes the fitting scale. */
export function score(
  guess: Float64Array,
  pay: Float64Array,
  toMoney: (v: number) => number,
): Recovery {
  const n = pay.length;
  const errors = new Float64Array(n);
  let within = 0;
  let exact = 0;
  for (let i = 0; i < n; i++) {
    const e = Math.abs(toMoney(guess[i]) - pay[i]);
    errors[i] = Number.isFinite(e) ? e : Infinity;
    if (e <= 0.01 * pay[i]) within++;
    if (e <= 1e-4 * pay[i]) exact++;
  }
  errors.sort();
  return { within1: within / n, exact: exact / n, medianError: errors[n >> 1] };
}

/**
 * The in-bag weights an attacker can derive, per tree and person, or null
 * when the file gives none: stored seeds, or the settings' seed put through
 * the resampler (kept only when they agree with the trees: every leaf holds
 * at least the minimum leaf of drawn members, and no one the split points
 * show was not drawn is drawn). Needs the roster in training order, or row
 * keys to put it there.
 */
export function derivableCounts(
  file: FileContents,
  roster: Roster,
  paths: number[][][],
  inTrainingOrder: boolean,
  zeros: Uint8Array[],
): { counts: Float64Array[]; how: string } | null {
  const order = trainingPositions(file, roster, inTrainingOrder);
  if (order === null) return null;
  const candidates: [string, (b: number) => Float64Array][] = [];
  if (file.seeds !== null) {
    const seeds = file.seeds;
    candidates.push([
      "stored seeds",
      (b) => legacyCounts(file.rowsUsed, seeds[b]),
    ]);
  }
  if (file.seed !== null) {
    const seed = file.seed;
    candidates.push([
      "the settings' seed through the resampler",
      (b) => legacyCounts(file.rowsUsed, legacySeed(seed, b)),
    ]);
  }
  for (const [how, regenerate] of candidates) {
    const counts = file.trees.map((_, b) => {
      const byTraining = regenerate(b);
      return Float64Array.from(order, (t) => (t < 0 ? NaN : byTraining[t]));
    });
    if (consistent(file, paths, counts, zeros)) return { counts, how };
  }
  return null;
}

// The per-tree seed of format 1 files (a 32-bit mix of the seed and index).
function legacySeed(seed: number, index: number): number {
  let h = (Math.imul(seed | 0, 0x9e3779b1) ^ Math.imul(index + 1, 0x85ebca6b)) >>> 0;
  h ^= h >>> 16;
  h = Math.imul(h, 0x85ebca6b) >>> 0;
  h ^= h >>> 13;
  h = Math.imul(h, 0xc2b2ae35) >>> 0;
  h ^= h >>> 16;
  return h | 0;
}

// Whether regenerated counts fit the trees: every leaf has at least the
// minimum leaf of drawn members, and no one known not to be drawn is.
function consistent(
  file: FileContents,
  paths: number[][][],
  counts: Float64Array[],
  zeros: Uint8Array[],
): boolean {
  for (let b = 0; b < file.trees.length; b++) {
    const t = file.trees[b];
    const drawn = new Int32Array(t.nodes);
    for (let i = 0; i < paths[b].length; i++) {
      if (!(counts[b][i] > 0)) continue;
      if (zeros[b][i] === 1) return false;
      const p = paths[b][i];
      drawn[p[p.length - 1]]++;
    }
    for (let node = 0; node < t.nodes; node++) {
      if (t.left[node] === -1 && drawn[node] < file.minLeaf) return false;
    }
  }
  return true;
}

// Each roster person's training position: from the stored row keys, or the
// roster's own order when the attacker holds it in training order.
function trainingPositions(
  file: FileContents,
  roster: Roster,
  inTrainingOrder: boolean,
): Int32Array | null {
  if (file.rowKeys !== null) {
    const byKey = new Map<string, number>();
    for (let t = 0; t * 12 < file.rowKeys.length; t++) {
      byKey.set(file.rowKeys.slice(12 * t, 12 * t + 12), t);
    }
    return Int32Array.from(
      roster.profiles,
      (x, i) => byKey.get(rowKey(roster.ids[i], x)) ?? -1,
    );
  }
  return inTrainingOrder ? Int32Array.from(roster.profiles, (_, i) => i) : null;
}

/**
 * Zeros an attacker can derive from split points: a numeric split sits
 * halfway between the two nearest values the tree drew on either side, so
 * a person reaching the node whose value lies strictly between those two
 * roster values (but on neither) was not drawn; a level the split's sets
 * leave out was not among the drawn rows at the node.
 */
export function derivableZeros(
  file: FileContents,
  roster: Roster,
  paths: number[][][],
): { zeros: Uint8Array[]; count: number } {
  let count = 0;
  const zeros = file.trees.map((t, b) => {
    const z = new Uint8Array(roster.profiles.length);
    const reach: number[][] = Array.from({ length: t.nodes }, () => []);
    paths[b].forEach((p, i) => {
      for (const node of p) reach[node].push(i);
    });
    for (let node = 0; node < t.nodes; node++) {
      if (t.left[node] === -1) continue;
      const f = t.feature[node];
      const people = reach[node];
      if (t.maskOffset[node] >= 0) {
        const words = t.maskWords[f];
        const off = t.maskOffset[node];
        for (const i of people) {
          const x = roster.profiles[i][f];
          if (Number.isNaN(x)) continue;
          const inLeft = ((t.masks[off + (x >>> 5)] >>> (x & 31)) & 1) === 1;
          const inRight = ((t.masks[off + words + (x >>> 5)] >>> (x & 31)) & 1) === 1;
          if (!inLeft && !inRight && z[i] === 0) {
            z[i] = 1;
            count++;
          }
        }
      } else {
        const th = t.threshold[node];
        if (!Number.isFinite(th)) continue;
        // The largest value at or below and the smallest above among the
        // people reaching the node; the midpoint of the drawn neighbours
        // is th, so values strictly inside (a, b) with a + b = 2 th that
        // are not a or b were not drawn.
        const values = people.map((i) => roster.profiles[i][f]).filter((v) => !Number.isNaN(v));
        const below = values.filter((v) => v <= th);
        const above = values.filter((v) => v > th);
        if (below.length === 0 || above.length === 0) continue;
        const nearestBelow = Math.max(...below);
        const nearestAbove = Math.min(...above);
        if (Math.abs(nearestBelow / 2 + nearestAbove / 2 - th) < 1e-12 * (1 + Math.abs(th))) {
          continue; // the neighbours themselves: nothing in between
        }
        // The drawn pair (a, b) with a/2 + b/2 = th: a is a roster value
        // below; try each, the first whose partner is a roster value.
        const distinct = [...new Set(values)].sort((p, q) => p - q);
        for (const a of distinct.filter((v) => v <= th).reverse()) {
          const bValue = distinct.find((v) =>
            v > th && Math.abs(a / 2 + v / 2 - th) < 1e-12 * (1 + Math.abs(th))
          );
          if (bValue === undefined) continue;
          for (const i of people) {
            const x = roster.profiles[i][f];
            if (x > a && x < bValue && z[i] === 0) {
              z[i] = 1;
              count++;
            }
          }
          break;
        }
      }
    }
    return z;
  });
  return { zeros, count };
}

/** Every roster person's path through the reference tree. */
export function referencePaths(file: FileContents, roster: Roster): number[][] {
  return roster.profiles.map((x) => pathOf(file.reference, x));
}

/**
 * (c) with node variances: within each reference leaf whose variance the
 * file keeps, the guesses shifted to the leaf's stored mean and stretched
 * to its stored variance. Null when the file keeps no variances.
 */
export function matchLeafVariance(
  guess: Float64Array,
  file: FileContents,
  refPaths: number[][],
): Float64Array | null {
  const impurity = file.reference.impurity;
  if (impurity === null) return null;
  const out = Float64Array.from(guess);
  const members = new Map<number, number[]>();
  refPaths.forEach((p, i) => {
    const leaf = p[p.length - 1];
    members.set(leaf, [...(members.get(leaf) ?? []), i]);
  });
  for (const [leaf, m] of members) {
    const mean = m.reduce((s, i) => s + guess[i], 0) / m.length;
    const variance = m.reduce((s, i) => s + (guess[i] - mean) ** 2, 0) / m.length;
    const stretch = variance > 0 ? Math.sqrt(impurity[leaf] / variance) : 0;
    for (const i of m) out[i] = file.reference.value[leaf] + (guess[i] - mean) * stretch;
  }
  return out;
}

/**
 * (c) with residual grids: people grouped by their estimate as the file's
 * groups are, ranked within the group by how far the guess puts them above
 * the estimate, and given the grid's residual at their rank. Null when the
 * file keeps no grids.
 */
export function matchResidualGrid(
  guess: Float64Array,
  estimate: Float64Array,
  file: FileContents,
): Float64Array | null {
  const grids = file.residuals;
  if (grids === null) return null;
  const groups: number[][] = grids.grids.map(() => []);
  estimate.forEach((e, i) => {
    let g = 0;
    while (g < grids.edges.length - 1 && e > grids.edges[g]) g++;
    groups[g].push(i);
  });
  const out = Float64Array.from(guess);
  groups.forEach((people, g) => {
    const grid = grids.grids[g];
    people.sort((p, q) => (guess[p] - estimate[p]) - (guess[q] - estimate[q]));
    people.forEach((i, rank) => {
      const h = ((rank + 0.5) / people.length) * (grid.length - 1);
      const lo = Math.floor(h);
      const hi = Math.min(grid.length - 1, lo + 1);
      out[i] = estimate[i] + grid[lo] + (h - lo) * (grid[hi] - grid[lo]);
    });
  });
  return out;
}

/**
 * (c) with node counts: each equation weighted by the share of the node's
 * roster members the file says were drawn (stored counts of drawn rows over
 * the members reaching it), internal nodes included. Null when the file's
 * counts are those of every training row (nothing to learn).
 */
export function countReliability(
  file: FileContents,
  paths: number[][][],
): ((b: number, node: number) => number) | null {
  const shares = file.trees.map((t, b) => {
    const reach = new Float64Array(t.nodes);
    for (const p of paths[b]) for (const node of p) reach[node]++;
    return Float64Array.from(
      reach,
      (r, node) => (t.rows === null || r === 0 ? 1 : t.rows[node] / r),
    );
  });
  if (shares.every((s) => s.every((v) => Math.abs(v - 1) < 1e-12))) return null;
  return (b, node) => Math.sqrt(Math.min(1, shares[b][node]));
}
