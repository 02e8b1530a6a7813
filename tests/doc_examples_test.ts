// Every exported function, class and constant of lib/ and tui/ carries a
// JSDoc `@example` whose fenced code calls `assert` (DEVELOPERS.md,
// Conventions). `deno test --doc` runs those examples; this test makes sure
// there is one to run, read from the source.
import assert from "node:assert/strict";
import { sources as readSources } from "./_sources.ts";

const sources = (dir: string) =>
  readSources(dir, (name) => name.endsWith(".ts") && !name.endsWith("_test.ts"));

/** A value export: `export [async] function|class|const NAME` at the start of a line. */
const EXPORT = /^export\s+(?:async\s+function\*?|function\*?|class|const)\s+([A-Za-z_$][\w$]*)/;

/** A call of `assert` or one of its methods (`assert(`, `assert.equal(`...). */
const ASSERT_CALL = /\bassert(?:\.\w+)?\s*\(/;

/**
 * The JSDoc block that ends on the line just above `line` (blank lines
 * between allowed), or undefined when the nearest text above is something else.
 */
function docAbove(lines: string[], line: number): string | undefined {
  let end = line - 1;
  while (end >= 0 && lines[end].trim() === "") end--;
  if (end < 0 || !lines[end].trimEnd().endsWith("*/")) return undefined;
  let start = end;
  while (start >= 0 && !lines[start].includes("/*")) start--;
  if (start < 0 || !lines[start].trimStart().startsWith("/**")) return undefined;
  return lines.slice(start, end + 1).join("\n");
}

/**
 * The fenced code blocks of each `@example` in a JSDoc block, but those
 * marked `ignore` (`deno test --doc` does not run them).
 */
function exampleCode(doc: string): string[] {
  const body = doc.split("\n").map((l) => l.replace(/^\s*\/?\*+\/?\s?/, "")).join("\n");
  const codes: string[] = [];
  for (const part of body.split(/^@example\b/m).slice(1)) {
    const example = part.split(/^@\w+/m)[0];
    for (const m of example.matchAll(/^```([^\n]*)\n([\s\S]*?)^```/gm)) {
      if (!/\bignore\b/.test(m[1])) codes.push(m[2]);
    }
  }
  return codes;
}

/** `file:line:name` of each value export without an example that asserts. */
export function exportsWithoutAssertingExample(path: string, text: string): string[] {
  const lines = text.split("\n");
  const missing: string[] = [];
  lines.forEach((line, i) => {
    const m = EXPORT.exec(line);
    if (!m) return;
    const doc = docAbove(lines, i);
    const asserts = doc !== undefined && exampleCode(doc).some((code) => ASSERT_CALL.test(code));
    if (!asserts) missing.push(`${path}:${i + 1}:${m[1]}`);
  });
  return missing;
}

Deno.test("the reader finds examples that assert and only those", () => {
  const text = [
    "/**",
    " * Asserts.",
    " *",
    " * @example",
    " * ```ts",
    ' * import assert from "node:assert/strict";',
    ' * import { a } from "./a.ts";',
    " * assert.equal(a(), 1);",
    " * ```",
    " */",
    "export function a(): number {",
    "  return 1;",
    "}",
    "/** No example. */",
    "export const b = 2;",
    "/**",
    " * An example that only imports assert, then the call outside the fence.",
    " *",
    " * @example",
    " * ```ts",
    ' * import assert from "node:assert/strict";',
    " * ```",
    " * assert(true)",
    " */",
    "export class C {}",
    "/**",
    " * The call under another tag than @example.",
    " *",
    " * @remarks",
    " * ```ts",
    " * assert(d());",
    " * ```",
    " */",
    "export async function d(): Promise<boolean> {",
    "  return true;",
    "}",
    "export type T = number;",
    "export interface I {}",
    'export { a as e } from "./a.ts";',
    "export const f = 3;",
    "/**",
    " * An example that is never run.",
    " *",
    " * @example",
    " * ```ts ignore",
    " * assert(g() === 1);",
    " * ```",
    " */",
    "export const g = () => 1;",
  ].join("\n");
  assert.deepEqual(exportsWithoutAssertingExample("x.ts", text), [
    "x.ts:15:b",
    "x.ts:25:C",
    "x.ts:34:d",
    "x.ts:40:f",
    "x.ts:49:g",
  ]);
});

Deno.test("every exported function, class and constant in lib/ and tui/ has an example that asserts", async () => {
  const files = [...await sources("lib"), ...await sources("tui")];
  // The walk reached both trees (a wrong root would find nothing and pass).
  assert(files.some((f) => f.path === "lib/table/missing.ts"));
  assert(files.some((f) => f.path === "tui/render/style.ts"));
  const missing = files.flatMap(({ path, text }) => exportsWithoutAssertingExample(path, text));
  assert.deepEqual(missing, [], `${missing.length} exports without an asserting @example`);
});
