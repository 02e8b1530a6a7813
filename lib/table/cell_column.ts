/**
 * One column's cells as they are read, kept compactly: while every cell is
 * a plain number (or missing) the column holds numbers in a growing
 * Float64Array and no text at all (the few cells whose text a number does
 * not give back, such as "40.10" or a missing-value token, are kept aside);
 * at the first other cell it turns into text, with repeated texts shared.
 * A million-row table thus costs about 8 bytes per numeric cell instead of
 * a string object per cell.
 *
 * @module
 */

import { MAX_AMOUNT_CHARS, PLAIN_NUMBER } from "./amount.ts";

// Texts shared while a column has at most this many distinct ones (levels);
// past it (identifiers) sharing saves nothing.
const SHARED_MAX = 65536;

// Exact powers of ten: a decimal of at most 15 digits is an integer below
// 2^53 over one of these, and one division of two exact doubles is
// correctly rounded, as Number() is (Clinger's fast path).
const POWERS_OF_TEN = Array.from({ length: 16 }, (_, k) => 10 ** k);

// A digit and a point or comma somewhere: a cell a decimal mark could change.
const NUMBER_LIKE = /\d.*[.,]|[.,].*\d/;

/**
 * Whether `String(value)` is `text` again, deciding most cells without
 * formatting the number (the costly part of reading a large table): a
 * plain decimal of at most 15 characters with no sign, leading zero,
 * trailing zero or exponent that JavaScript would write differently.
 */
function givesBack(text: string, value: number): boolean {
  const n = text.length;
  if (n > 15) return String(value) === text;
  const first = text.charCodeAt(0);
  // "+5", "-0", ".5", "05": written differently.
  if (first === 43 || first === 46) return false;
  const digits = first === 45 ? 1 : 0;
  const lead = text.charCodeAt(digits);
  if (lead === 46) return false; // "-.5" is written "-0.5"
  const dot = text.indexOf(".");
  if (lead === 48 && n > digits + 1 && text.charCodeAt(digits + 1) !== 46) return false;
  if (text.indexOf("e") >= 0 || text.indexOf("E") >= 0) return String(value) === text;
  if (dot >= 0) {
    const last = text.charCodeAt(n - 1);
    if (last === 48 || last === 46) return false; // "40.10", "40."
    // Below 1e-6 JavaScript switches to exponents ("1e-7").
    if (lead === 48 && text.startsWith("0.00000", digits)) return String(value) === text;
  }
  return !(first === 45 && value === 0); // "-0" and "-0.0" read as 0
}

/**
 * Cells of one column.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { CellColumn } from "./cell_column.ts";
 * const plain = new CellColumn((t) => t === "" || t === "NA");
 * for (const t of ["85000", "40.10", "NA", ""]) plain.push(t);
 * assert(plain.plain !== null && plain.plain[1] === 40.1);
 * assert.deepEqual(plain.texts(), ["85000", "40.10", "NA", ""]);
 * const text = new CellColumn(() => false);
 * for (const t of ["1", "L2", "L2"]) text.push(t);
 * assert(text.plain === null && text.texts().join() === "1,L2,L2");
 * ```
 */
export class CellColumn {
  #isMissing: (text: string) => boolean;
  #isMissingAt: (text: string, start: number, end: number) => boolean;
  // The shared texts again, found by the characters of a cell not yet cut
  // out (open addressing on a hash of them; see #pushTextAt): each slot's
  // hash and shared text's number (-1: empty).
  #internHashes = new Int32Array(0);
  #internIds = new Int32Array(0);
  #internCount = 0;
  #values: Float64Array | null = new Float64Array(1024);
  // Rows (ascending) whose text a number does not give back, and those texts.
  #asideRows: number[] = [];
  #asideTexts: string[] = [];
  #texts: string[] | null = null;
  // The distinct texts, numbered in order of first appearance, and how many
  // cells hold each (null past SHARED_MAX of them).
  #shared: Map<string, number> | null = null;
  #sharedTexts: string[] = [];
  #sharedCounts = new Int32Array(0);
  // Whether the counts are every cell's (not after keep()).
  #counted = true;
  #length = 0;

  /**
   * @param isMissing Which texts mean missing.
   * @param isMissingAt The same test on `text.slice(start, end)` (see
   * missingTestAt), for {@linkcode CellColumn.pushAt}; by default the cell is cut out.
   */
  constructor(
    isMissing: (text: string) => boolean,
    isMissingAt?: (text: string, start: number, end: number) => boolean,
  ) {
    this.#isMissing = isMissing;
    this.#isMissingAt = isMissingAt ?? ((text, start, end) => isMissing(text.slice(start, end)));
  }

  /**
   * Adds the cell `text.slice(start, end)`, trimmed: the same as
   * {@linkcode CellColumn.push} of that text, but a plain number or a
   * repeated text is taken where it lies, without a string of its own.
   *
   * @example
   * ```ts
   * import assert from "node:assert/strict";
   * import { CellColumn } from "./cell_column.ts";
   * const row = "85000,40.10, 7 ,-0";
   * const column = new CellColumn((t) => t === "");
   * for (const [s, e] of [[0, 5], [6, 11], [12, 15], [16, 18]]) column.pushAt(row, s, e);
   * assert.deepEqual([...column.plain!], [85000, 40.1, 7, -0]);
   * assert.deepEqual(column.texts(), ["85000", "40.10", "7", "-0"]);
   * ```
   */
  pushAt(text: string, start: number, end: number): void {
    // First and last characters printable ASCII: trim() would change nothing.
    if (end > start) {
      const first = text.charCodeAt(start);
      const last = text.charCodeAt(end - 1);
      if (first > 32 && first < 127 && last > 32 && last < 127) {
        if (this.#values !== null) {
          if (this.#pushNumberAt(text, start, end)) return;
        } else if (this.#shared !== null) {
          this.#pushTextAt(text, start, end);
          return;
        }
      }
    }
    this.push(text.slice(start, end).trim());
  }

  // A plain decimal "-?(0|[1-9]\d*)(\.\d+)?" of at most 15 characters, not
  // "-0" nor below 0.00001 (givesBack's sure cases: its number gives its
  // text back, or would but for trailing zeros after the point, and then
  // the text is kept aside) read from its characters; false for any other
  // cell, which then takes push().
  #pushNumberAt(text: string, start: number, end: number): boolean {
    if (end - start > 15) return false;
    let i = start;
    const negative = text.charCodeAt(i) === 45;
    if (negative) i++;
    if (i === end) return false;
    let c = text.charCodeAt(i);
    // A leading zero only before the point ("0.5"; "007" is written "7").
    const zero = c === 48;
    if (zero && i + 1 < end && text.charCodeAt(i + 1) !== 46) return false;
    let mantissa = 0;
    const integerFrom = i;
    while (i < end) {
      c = text.charCodeAt(i);
      if (c < 48 || c > 57) break;
      mantissa = mantissa * 10 + (c - 48);
      i++;
    }
    if (i === integerFrom) return false;
    let fraction = 0;
    if (i < end) {
      if (c !== 46 || i + 1 === end) return false; // not a point, or "40."
      // "0.00000..." is written with an exponent below 1e-6.
      if (zero && text.startsWith("00000", i + 1)) return false;
      for (i++; i < end; i++) {
        c = text.charCodeAt(i);
        if (c < 48 || c > 57) return false;
        mantissa = mantissa * 10 + (c - 48);
        fraction++;
      }
    }
    if (negative && mantissa === 0) return false; // "-0"
    if (this.#isMissingAt(text, start, end)) return false;
    const magnitude = fraction === 0 ? mantissa : mantissa / POWERS_OF_TEN[fraction];
    const r = this.#length++;
    if (r === this.#values!.length) this.#grow();
    this.#values![r] = negative ? -magnitude : magnitude;
    // "40.10" is written "40.1": its text is kept aside, as push() keeps it.
    if (fraction > 0 && c === 48) {
      this.#asideRows.push(r);
      this.#asideTexts.push(text.slice(start, end));
    }
    return true;
  }

  // A text column's cell, shared with the same text seen before, found by
  // its characters; cut out only when it is new.
  #pushTextAt(text: string, start: number, end: number): void {
    let hash = 0x811c9dc5;
    for (let i = start; i < end; i++) hash = Math.imul(hash ^ text.charCodeAt(i), 0x01000193);
    const hashes = this.#internHashes;
    const ids = this.#internIds;
    const mask = hashes.length - 1;
    if (mask > 0) {
      for (let slot = hash & mask; ids[slot] >= 0; slot = (slot + 1) & mask) {
        const id = ids[slot];
        const known = this.#sharedTexts[id];
        if (
          hashes[slot] === hash && known.length === end - start && text.startsWith(known, start)
        ) {
          this.#length++;
          this.#texts!.push(known);
          this.#sharedCounts[id]++;
          return;
        }
      }
    }
    const cell = text.slice(start, end);
    this.#length++;
    this.#pushText(cell);
    if (this.#shared !== null) this.#intern(this.#shared.get(cell)!, hash);
  }

  // Records shared text number `id` for #pushTextAt, the table kept at most half full.
  #intern(id: number, hash: number): void {
    if (2 * (this.#internCount + 1) > this.#internHashes.length) {
      const old = this.#internIds;
      const oldHashes = this.#internHashes;
      const size = Math.max(64, 2 * oldHashes.length);
      this.#internHashes = new Int32Array(size);
      this.#internIds = new Int32Array(size).fill(-1);
      this.#internCount = 0;
      for (let slot = 0; slot < old.length; slot++) {
        if (old[slot] >= 0) this.#intern(old[slot], oldHashes[slot]);
      }
    }
    const mask = this.#internHashes.length - 1;
    let slot = hash & mask;
    while (this.#internIds[slot] >= 0) slot = (slot + 1) & mask;
    this.#internHashes[slot] = hash;
    this.#internIds[slot] = id;
    this.#internCount++;
  }

  #grow(): void {
    const grown = new Float64Array(this.#values!.length * 2);
    grown.set(this.#values!);
    this.#values = grown;
  }

  /** Number of cells. */
  get length(): number {
    return this.#length;
  }

  /** Adds one (trimmed) cell. */
  push(text: string): void {
    const r = this.#length++;
    if (this.#values !== null) {
      let value = NaN;
      const missing = this.#isMissing(text);
      if (!missing && text.length <= MAX_AMOUNT_CHARS && PLAIN_NUMBER.test(text)) {
        value = Number(text);
      }
      // Not plain, or too large to be a number (1e400): the column is text.
      if (!missing && !Number.isFinite(value)) {
        this.#toText(r);
        this.#pushText(text);
        return;
      }
      if (r === this.#values.length) this.#grow();
      this.#values![r] = value;
      // Keep the text when the number does not give it back.
      if (missing ? text !== "" : !givesBack(text, value)) {
        this.#asideRows.push(r);
        this.#asideTexts.push(text);
      }
      return;
    }
    this.#pushText(text);
  }

  /**
   * The values when every cell was a plain number or missing (NaN), else
   * null. Missing cells are NaN.
   */
  get plain(): Float64Array | null {
    return this.#values === null ? null : this.#values.subarray(0, this.#length);
  }

  /** Every cell's text, as read. */
  texts(): string[] {
    return this.#texts ?? this.#textsOf(this.#length);
  }

  // The texts of the first `count` cells of a plain column.
  #textsOf(count: number): string[] {
    const values = this.#values!;
    const out = new Array<string>(count);
    for (let r = 0; r < count; r++) out[r] = Number.isNaN(values[r]) ? "" : String(values[r]);
    for (let i = 0; i < this.#asideRows.length && this.#asideRows[i] < count; i++) {
      out[this.#asideRows[i]] = this.#asideTexts[i];
    }
    return out;
  }

  /**
   * The distinct texts of this column's cells that hold a digit and a point
   * or a comma (the cells a decimal mark could change), at most `limit` of
   * them, for judging the file's decimal mark.
   */
  numberLikeTexts(limit = 1000): string[] {
    const found = new Set<string>();
    const add = (text: string) => {
      if (found.size < limit && NUMBER_LIKE.test(text)) found.add(text);
    };
    if (this.#values !== null) {
      const values = this.#values;
      // Text given back by the number: only non-integers hold a point.
      const aside = this.#asideRows;
      let a = 0;
      for (let r = 0; r < this.#length && found.size < limit; r++) {
        while (a < aside.length && aside[a] < r) a++;
        if (a < aside.length && aside[a] === r) add(this.#asideTexts[a]);
        else if (!Number.isInteger(values[r]) && !Number.isNaN(values[r])) add(String(values[r]));
      }
    } else {
      const texts = this.#texts!;
      for (let r = 0; r < texts.length && found.size < limit; r++) add(texts[r]);
    }
    return [...found];
  }

  /** Keeps only the cells at `rows` (ascending), e.g. the rows whose target is present. */
  keep(rows: readonly number[]): void {
    if (this.#values !== null) {
      const values = new Float64Array(Math.max(rows.length, 1));
      const asideRows: number[] = [];
      const asideTexts: string[] = [];
      // Both lists ascend: walk them together.
      let a = 0;
      rows.forEach((r, i) => {
        values[i] = this.#values![r];
        while (a < this.#asideRows.length && this.#asideRows[a] < r) a++;
        if (a < this.#asideRows.length && this.#asideRows[a] === r) {
          asideRows.push(i);
          asideTexts.push(this.#asideTexts[a]);
        }
      });
      this.#values = values;
      this.#asideRows = asideRows;
      this.#asideTexts = asideTexts;
    } else {
      const texts = this.#texts!;
      this.#texts = rows.map((r) => texts[r]);
      // The counts were of the cells before.
      this.#counted = false;
    }
    this.#length = rows.length;
  }

  /**
   * Each distinct text of a text column with the number of cells that hold
   * it, in order of first appearance, counted as the cells came in; null
   * for a column of numbers, one with more than `limit` distinct texts, or
   * after {@linkcode CellColumn.keep}.
   *
   * @example
   * ```ts
   * import assert from "node:assert/strict";
   * import { CellColumn } from "./cell_column.ts";
   * const column = new CellColumn((t) => t === "");
   * const row = "L2,L1,L2,";
   * column.push("7");
   * for (const [s, e] of [[0, 2], [3, 5], [6, 8], [9, 9]]) column.pushAt(row, s, e);
   * assert.deepEqual([...column.distinct(10)!], [["7", 1], ["L2", 2], ["L1", 1], ["", 1]]);
   * assert.equal(column.distinct(2), null);
   * column.keep([0, 1]);
   * assert.equal(column.distinct(10), null);
   * ```
   */
  distinct(limit: number): Map<string, number> | null {
    if (this.#shared === null || !this.#counted || this.#texts === null) return null;
    if (this.#sharedTexts.length > limit) return null;
    return new Map(this.#sharedTexts.map((text, id) => [text, this.#sharedCounts[id]]));
  }

  #toText(count: number): void {
    this.#texts = this.#textsOf(count);
    this.#values = null;
    this.#asideRows = [];
    this.#asideTexts = [];
    this.#shared = new Map();
    this.#sharedTexts = [];
    this.#sharedCounts = new Int32Array(64);
    for (let r = 0; r < this.#texts.length; r++) this.#texts[r] = this.#share(this.#texts[r]);
  }

  #pushText(text: string): void {
    this.#texts!.push(this.#share(text));
  }

  #share(text: string): string {
    const shared = this.#shared;
    if (shared === null) return text;
    const id = shared.get(text);
    if (id !== undefined) {
      this.#sharedCounts[id]++;
      return this.#sharedTexts[id];
    }
    if (shared.size >= SHARED_MAX) {
      this.#shared = null;
      this.#sharedTexts = [];
      this.#sharedCounts = new Int32Array(0);
      this.#internHashes = new Int32Array(0);
      this.#internIds = new Int32Array(0);
      return text;
    }
    const next = this.#sharedTexts.length;
    if (next === this.#sharedCounts.length) {
      const grown = new Int32Array(2 * next);
      grown.set(this.#sharedCounts);
      this.#sharedCounts = grown;
    }
    shared.set(text, next);
    this.#sharedTexts.push(text);
    this.#sharedCounts[next] = 1;
    return text;
  }
}
