// The two layers' rules, read from the source: the terminal layer (tui/)
// imports the library only through mod.ts and computes no statistic (no
// exp, log, square root or power: a formatting helper that needs one lives
// in the library); the library (lib/) writes no command-line flag into its
// texts, and imports no later layer (lib/table -> dataset -> tree ->
// ensemble -> linear -> model -> gap; io, errors and random from anywhere).
import assert from "node:assert/strict";
import { ROOT as root, sources as readSources } from "./_sources.ts";

const sources = (dir: string) => readSources(dir);

/** The code of a file with comments blanked out (line numbers kept). */
export function withoutComments(text: string): string {
  // Strings are kept as they are (a "//" inside a URL string is not a comment).
  return text.replace(
    /("(?:[^"\\\n]|\\.)*"|'(?:[^'\\\n]|\\.)*'|`(?:[^`\\]|\\.)*`)|\/\*[\s\S]*?\*\/|\/\/[^\n]*/g,
    (match, string) => string ?? match.replace(/[^\n]/g, " "),
  );
}

/** The code with comments and the insides of strings blanked out. */
function codeOnly(text: string): string {
  return withoutComments(text).replace(
    /"(?:[^"\\\n]|\\.)*"|'(?:[^'\\\n]|\\.)*'|`(?:[^`\\]|\\.)*`/g,
    (s) => s.replace(/[^\n]/g, " "),
  );
}

function hits(
  files: { path: string; text: string }[],
  pattern: RegExp,
  read: (text: string) => string = withoutComments,
): string[] {
  const found: string[] = [];
  for (const { path, text } of files) {
    read(text).split("\n").forEach((line, i) => {
      if (pattern.test(line)) found.push(`${path}:${i + 1}: ${line.trim()}`);
    });
  }
  return found;
}

Deno.test("the rules' own reader: comments are left out, strings kept", () => {
  const code = 'const a = "http://x"; // Math.exp here\n/* --where */ const b = Math.exp(1);';
  const plain = withoutComments(code);
  assert.match(plain, /"http:\/\/x"/);
  assert.doesNotMatch(plain, /here|--where/);
  assert.match(plain.split("\n")[1], /Math\.exp\(1\)/);
});

Deno.test("the terminal layer computes no statistic: no exp, log, sqrt or pow", async () => {
  const tui = await sources("tui");
  // A power of a variable (constants such as 2 ** 31 are bounds, not figures).
  const found = hits(
    tui,
    /Math\.(exp|expm1|log|log1p|log2|log10|sqrt|cbrt|pow)\b|[A-Za-z_)\]]\s*\*\*|\*\*\s*[A-Za-z_(]/,
    codeOnly,
  );
  assert.deepEqual(found, []);
});

Deno.test("the terminal layer reaches the library only through mod.ts", async () => {
  const tui = await sources("tui");
  assert.deepEqual(hits(tui, /from\s+"(\.\.\/)+lib\//), []);
});

// Each layer of the library and the layers it may import.
const MAY_IMPORT: Record<string, string[]> = {
  table: [],
  dataset: ["table"],
  tree: ["table", "dataset"],
  ensemble: ["table", "dataset", "tree"],
  linear: ["table", "dataset", "tree", "ensemble"],
  demo: ["table"],
  model: ["table", "dataset", "tree", "ensemble", "linear", "demo"],
  gap: ["table", "dataset", "tree", "ensemble", "linear", "model"],
  io: [],
};

Deno.test("no import in the library runs backwards", async () => {
  const lib = await sources("lib");
  const backwards: string[] = [];
  for (const { path, text } of lib) {
    const layer = path.split("/")[1];
    if (!(layer in MAY_IMPORT)) continue; // lib/errors.ts, random.ts, version.ts
    for (const m of withoutComments(text).matchAll(/from\s+"\.\.\/([a-z_]+)\//g)) {
      const to = m[1];
      if (to !== layer && to !== "io" && to in MAY_IMPORT && !MAY_IMPORT[layer].includes(to)) {
        backwards.push(`${path} imports lib/${to}`);
      }
    }
  }
  assert.deepEqual(backwards, []);
});

// The library names options in its messages and notes as {privacyMin}
// (lib/errors.ts optionText; the terminal writes the flag, tui/option_words.ts),
// and its answers' notes are data worded in tui/render: no line of lib/
// outside comments names a command-line flag.
Deno.test("the library writes no command-line flag into its texts", async () => {
  const lib = await sources("lib");
  assert.deepEqual(hits(lib, /["'`][^"'`]*--[a-z][a-z-]+/), []);
});

// Tests mirror the code: every module of the library has a test file of
// the same name under tests/lib/ (types.ts and mod.ts hold no behaviour of
// their own: type declarations and re-exports).
Deno.test("every library module has its test file of the same name", async () => {
  const lib = await sources("lib");
  const missing: string[] = [];
  for (const { path } of lib) {
    if (/\/(types|mod)\.ts$/.test(path)) continue;
    const test = path.replace(/^lib\//, "tests/lib/").replace(/\.ts$/, "_test.ts");
    try {
      await Deno.stat(`${root}${test}`);
    } catch {
      missing.push(`${path} has no ${test}`);
    }
  }
  assert.deepEqual(missing, []);
});
