// The destination functions on any text (fast-check), each judged by a
// reader we did not write: JSON.parse for JSON, csv-parse 7.0.3 for CSV,
// markdown-it 15.0.3 for Markdown. And every command run in-process on the
// hostile table, with a recording terminal that has no last guard, so that
// what the renderers write is safe by itself.
import assert from "node:assert/strict";
import fc from "fast-check";
import { parse } from "csv-parse/sync";
// @ts-types="@types/markdown-it"
import MarkdownIt from "markdown-it";
import {
  csvCell,
  forTerminal,
  jsonText,
  markdownText,
  terminalGuard,
  terminalText,
} from "../../tui/render/safe_text.ts";
import { run } from "../../tui/main.ts";
import { recordingTerminal } from "../../tui/terminal.ts";
import { ATTACK, HOSTILE_IDS, hostileCsv, RAW_CONTROL, rawControl } from "../e2e/_hostile.ts";

// Texts rich in what matters: controls, bidi, formula starts, markup.
const hostileText = fc.string({
  unit: fc.oneof(
    fc.constantFrom(
      "\x1b",
      "\x07",
      "\b",
      "\r",
      "\n",
      "\t",
      "\x7f",
      "\u009b",
      "\u0085",
      "\u202e",
      "\u2066",
      "\u200f",
      "\u2028",
      "=",
      "+",
      "-",
      "@",
      "<",
      ">",
      "&",
      "[",
      "]",
      "(",
      ")",
      "|",
      "\\",
      "`",
      "*",
      "_",
      "#",
      '"',
      ",",
      "'",
    ),
    fc.string({ minLength: 1, maxLength: 1 }),
    fc.constantFrom("0", "1", "9", ".", "e"),
  ),
  maxLength: 20,
});

Deno.test("terminalText leaves no control character and keeps text without them", () => {
  fc.assert(fc.property(hostileText, (text) => {
    const shown = terminalText(text);
    assert.equal(rawControl(shown), null);
    if (!RAW_CONTROL.test(text) && !/[\t\n]/.test(text)) assert.equal(shown, text);
    // Idempotent: what is shown is shown as it is.
    assert.equal(terminalText(shown), shown);
  }));
});

Deno.test("terminalGuard keeps only line breaks, tabs and (when styled) SGR styles", () => {
  fc.assert(fc.property(hostileText, (text) => {
    assert.equal(rawControl(terminalGuard(text, false)), null);
    const styled = terminalGuard(`\x1b[1m${text}\x1b[22m`, true);
    assert.ok(styled.startsWith("\x1b[1m") && styled.endsWith("\x1b[22m"));
    // Once the styles are taken out, nothing acting is left.
    // deno-lint-ignore no-control-regex
    assert.equal(rawControl(styled.replace(/\x1b\[[0-9;]*m/g, "")), null);
  }));
});

Deno.test("jsonText gives back the exact text and writes no raw control character", () => {
  fc.assert(fc.property(fc.dictionary(hostileText, hostileText), (doc) => {
    const text = jsonText(doc);
    assert.equal(rawControl(text), null);
    assert.deepEqual(Object.entries(JSON.parse(text)), Object.entries(doc));
  }));
});

// A spreadsheet takes a cell for a formula when it starts like one (OWASP,
// "CSV Injection"; common practice).
const FORMULA = /^[=+\-@\t\r]/;

Deno.test("csvCell: csv-parse reads back the text, apostrophed where it starts a formula", () => {
  fc.assert(fc.property(fc.array(hostileText, { minLength: 1, maxLength: 4 }), (cells) => {
    const line = cells.map(csvCell).join(",");
    const [record] = parse(line + "\n", { relax_column_count: true }) as string[][];
    assert.equal(record.length, cells.length, JSON.stringify(line));
    record.forEach((read, i) => {
      // The text as shown (controls visible but tab and line feed), with an
      // apostrophe before a formula start unless it is a number.
      const shown = cells[i].replace(
        new RegExp(RAW_CONTROL.source, "g"),
        (c) => terminalText(c),
      ).replace(/\r/g, "\\r");
      assert.ok(
        read === shown || read === `'${shown}`,
        `${JSON.stringify(read)} ${JSON.stringify(shown)}`,
      );
      if (FORMULA.test(read)) assert.match(read, /^-(\d[\d.,]*|[.,]\d[\d.,]*)([eE][+-]?\d+)?$/);
    });
  }));
  // Numbers, however they start, get no apostrophe (a comma in one is quoted, as RFC 4180 says).
  for (const n of ["-3", "-0.03", "-1e-7", "12"]) assert.equal(csvCell(n), n);
  for (const n of ["-1,000.50", "-3,5"]) assert.equal(csvCell(n), `"${n}"`);
});

Deno.test("markdownText: markdown-it renders the text itself, never markup", () => {
  const md = new MarkdownIt({ html: true, linkify: false });
  fc.assert(fc.property(hostileText, (text) => {
    const html = md.renderInline(markdownText(text));
    // No tag, entity of our own making aside, and the text comes back.
    assert.doesNotMatch(html, /<(?!br)/, html);
    const back = html.replace(/&lt;/g, "<").replace(/&gt;/g, ">").replace(/&quot;/g, '"')
      .replace(/&amp;/g, "&");
    assert.equal(back, terminalText(text), JSON.stringify(text));
  }));
  // In a table cell, a pipe stays in its cell.
  const table = md.render(`| a | b |\n| --- | --- |\n| ${markdownText("x|y")} | 2 |\n`);
  assert.match(table, /<td>x\|y<\/td>\s*<td>2<\/td>/);
});

Deno.test("forTerminal shares what is already safe and copies what is not", () => {
  const levels = ["G1", "G2"];
  const doc = { a: { levels }, b: ["\x1b[2J"], c: new Float64Array(2) };
  const shown = forTerminal(doc);
  assert.equal(shown.a, doc.a);
  assert.equal(shown.c, doc.c);
  assert.deepEqual(shown.b, ["\\x1b[2J"]);
  assert.deepEqual(doc.b, ["\x1b[2J"]);
});

Deno.test("every command's text, rendered in-process, is safe without the terminal's guard", async () => {
  const dir = await Deno.makeTempDir();
  const table = `${dir}/pay.csv`;
  await Deno.writeTextFile(table, await hostileCsv(200));
  const model = `${dir}/model.json`;
  const T = ["--target", "base_pay_eur"];
  const F = ["--trees", "10", "--workers", "1"];
  const runs: [string[], number][] = [
    [["schema", table, ...T], 0],
    [["fit", table, ...T, ...F, "--folds", "3", "--out", model], 0],
    [["inspect", model, "--tree", "--importance"], 0],
    [["estimate", model, "--set", `site=${ATTACK.title}`], 0],
    [["estimate", model, "--table", table, "--row", HOSTILE_IDS[6]], 0],
    [["compare", model, "--change", `job_family=${ATTACK.rlo}`], 0],
    [["sweep", model, "--vary", "site"], 0],
    [["batch", model, table], 0],
    [["gap", table, ...T, "--group", "gender", "--within", "site", "--privacy-min", "3", ...F], 0],
    [["review", table, ...T, "--within", "job_family", ...F], 0],
    [["estimate", model, "--set", "site=\x1b]0;x\x07"], 2],
    [["sweep", model, "--vary", "\x1b[2Jnope"], 2],
  ];
  for (const [args, code] of runs) {
    const terminal = recordingTerminal(80);
    assert.equal(await run(args, terminal), code, `${args[0]}: ${terminal.stderr.join("")}`);
    const out = terminal.stdout.join("") + terminal.stderr.join("");
    assert.equal(rawControl(out), null, `${args.slice(0, 2).join(" ")}: ${rawControl(out)}`);
  }
  await Deno.remove(dir, { recursive: true });
});
