// The explore screen driven through injected streams into a headless
// terminal emulator (@xterm/headless), read as a person would see it after
// each key: the figures those of the library's compare for the same start
// and moves (what `paygrove compare --json` prints), the money axis fixed,
// the selected attribute marked without colour, nothing outside 80 x 24,
// and every way out (q, Esc, Ctrl-C) leaving the screen as it was found.
import assert from "node:assert/strict";
import { PassThrough } from "node:stream";
import xterm from "@xterm/headless";
import {
  applyChanges,
  compareAnswer,
  estimateProfile,
  fitModel,
  loadTable,
  openModel,
  type Profile,
  typicalProfile,
} from "../../../mod.ts";
import { exploreSession } from "../../../tui/explore/explore_loop.ts";
import { formatPay } from "../../../tui/render/numbers.ts";
import { makeStyle } from "../../../tui/render/style.ts";
import { paygrove, ROOT } from "../../e2e/_cli.ts";

const demo = `${ROOT}fixtures/demo_company.csv`;
const model = await fitModel(loadTable(await Deno.readTextFile(demo)), {
  target: "base_pay_eur",
  trees: 30,
  folds: 3,
  workers: 1,
});
const session = openModel(model);
const money = {};
const pay = (v: number) => formatPay(v, money);

const KEY = {
  up: "\x1b[A",
  down: "\x1b[B",
  right: "\x1b[C",
  left: "\x1b[D",
  esc: "\x1b",
  ctrlC: "\x03",
};

// One session on an emulated 80 x 24 terminal.
function drive(start: Profile, cols = 80, rows = 24) {
  const term = new xterm.Terminal({ cols, rows, allowProposedApi: true });
  const input = new PassThrough();
  const output = new PassThrough();
  let bytes = "";
  const pending: Promise<void>[] = [];
  output.on("data", (chunk) => {
    bytes += chunk;
    pending.push(new Promise((resolve) => term.write(String(chunk), resolve)));
  });
  const done = exploreSession(
    { input, output, width: cols, height: rows, style: makeStyle(false), money, ascii: true },
    session,
    start,
  );
  const settle = async (ms = 40) => {
    await new Promise((resolve) => setTimeout(resolve, ms));
    await Promise.all(pending);
  };
  return {
    done,
    term,
    bytes: () => bytes,
    async press(...keys: string[]) {
      for (const key of keys) {
        input.write(key);
        await settle(key === KEY.esc ? 700 : 40);
      }
    },
    screen(): string[] {
      const buffer = term.buffer.active;
      return Array.from({ length: rows }, (_, i) => buffer.getLine(i)!.translateToString(true));
    },
  };
}

const start = applyChanges(model, typicalProfile(model), ["level=G2", "job_family=Sales"]).profile;
// The part of the screen's first line holding `prefix`, from it on.
const line = (screen: string[], prefix: string) => {
  const found = screen.find((l) => l.includes(prefix));
  assert(found !== undefined, `a line with "${prefix}":\n${screen.join("\n")}`);
  return found.slice(found.indexOf(prefix));
};

Deno.test("a promotion, a site change and an undo: the figures are compare's, the axis stays", async () => {
  const s = drive(start);
  await s.press(); // the first frame
  const first = s.screen();
  assert.equal(s.term.buffer.active.type, "alternate");
  assert(
    line(first, "Estimate ").startsWith(
      `Estimate ${pay(compareAnswer(session, start, start).changed.estimate)}`,
    ),
  );
  // The axis's ends, on the line under the one-person bar.
  const axisAt = first.findIndex((l) => l.startsWith("one person")) + 1;
  assert.match(first[axisAt], /^\s{17}[\d,]+\s+[\d,]+$/);

  // Down to level, right: a promotion.
  await s.press(KEY.down, KEY.right);
  const promoted = applyChanges(model, start, ["level=+1"]).profile;
  const answer = compareAnswer(session, start, promoted);
  let screen = s.screen();
  assert(line(screen, "> level").includes("G3 *"), "the selected attribute is marked with >");
  assert(line(screen, "Estimate ").startsWith(`Estimate ${pay(answer.changed.estimate)}`));
  assert(line(screen, "Start ").startsWith(`Start    ${pay(answer.base.estimate)}`));
  const d = answer.difference;
  assert(line(screen, "90% sure").includes(`+${pay(d.low!)} to +${pay(d.high!)}`));
  assert.equal(screen[axisAt], first[axisAt], "the money axis does not move");

  // Down to site, right: the next site in the model's order.
  await s.press(KEY.down, KEY.down, KEY.down, KEY.right);
  const site = model.features.find((f) => f.name === "site")!;
  const siteIndex = model.features.indexOf(site);
  const moved = Float64Array.from(promoted);
  moved[siteIndex] = Math.min(site.levels!.length - 1, promoted[siteIndex] + 1);
  screen = s.screen();
  assert(line(screen, "> site").includes(`${site.levels![moved[siteIndex]]} *`));
  assert(
    line(screen, "Estimate ").startsWith(
      `Estimate ${pay(compareAnswer(session, start, moved).changed.estimate)}`,
    ),
  );
  assert.equal(screen[axisAt], first[axisAt]);

  // Undo: back to the promotion alone.
  await s.press("u");
  screen = s.screen();
  assert(line(screen, "Estimate ").startsWith(`Estimate ${pay(answer.changed.estimate)}`));
  assert(!line(screen, "> site").includes("*"));

  // Nothing outside 80 x 24: no line scrolled off, none wrapped.
  assert.equal(s.term.buffer.active.length, 24);
  await s.press("q");
  const result = await s.done;
  assert.equal(result.status, 0);
  assert.equal(s.term.buffer.active.type, "normal", "the screen as it was found");
  assert(s.bytes().endsWith("\x1b[?25h\x1b[?1049l"), "the cursor shown again");
});

Deno.test("Esc leaves with status 0, Ctrl-C with 130; both restore the screen and the cursor", async () => {
  for (const [key, status] of [[KEY.esc, 0], [KEY.ctrlC, 130]] as const) {
    const s = drive(start);
    await s.press(KEY.down, KEY.right, key);
    const result = await s.done;
    assert.equal(result.status, status);
    assert.equal(s.term.buffer.active.type, "normal");
    assert(s.bytes().lastIndexOf("\x1b[?25h") > s.bytes().lastIndexOf("\x1b[?25l"));
  }
});

Deno.test("a typed value, a refusal, an offer, the keys; a redraw writes only what changed", async () => {
  const s = drive(start);
  await s.press(KEY.down, KEY.down); // years_experience
  const before = s.bytes().length;
  await s.press("1", "2", "\r");
  let screen = s.screen();
  assert(line(screen, "> years_experience").includes("12 *"));
  // A level the model never saw is refused on the screen, not by a crash.
  await s.press(KEY.up, "\r", "G", "9", "\r");
  screen = s.screen();
  assert(screen.some((l) => /G9/.test(l) && /level/.test(l)), screen.join("\n"));
  // An offer that is no amount is said on the screen, not a crash.
  await s.press("o", "a", "b", "c", "\r");
  assert(
    s.screen().some((l) => /abc/.test(l) && !l.startsWith("Offer abc_")),
    s.screen().join("\n"),
  );
  await s.press("o", "7", "0", "0", "0", "0", "\r");
  assert(s.screen().some((l) => l.startsWith("Offer 70,000: ")));
  await s.press("?");
  assert(s.screen().some((l) => l.includes("keep this profile as a scenario")));
  await s.press("?");
  // One move: a few lines rewritten, never the whole screen.
  const mark = s.bytes().length;
  await s.press(KEY.right);
  const written = s.bytes().length - mark;
  assert(written > 0 && written < 1500, `${written} bytes for one move`);
  assert(mark > before);
  await s.press("q");
  await s.done;
});

Deno.test("at 60 x 20 it still fits", async () => {
  const s = drive(start, 60, 20);
  await s.press(KEY.down, KEY.right);
  assert.equal(s.term.buffer.active.length, 20);
  assert(s.screen().some((l) => l.startsWith("> level")));
  await s.press("q");
  await s.done;
});

Deno.test("the screen's promotion equals paygrove compare --json for the same start and change", async () => {
  const dir = await Deno.makeTempDir();
  const path = `${dir}/m.json`;
  const { writeModelFile } = await import("../../../mod.ts");
  await writeModelFile(path, model);
  const run = await paygrove([
    "compare",
    path,
    "--set",
    "level=G2",
    "--set",
    "job_family=Sales",
    "--change",
    "level=+1",
    "--json",
  ]);
  assert.equal(run.code, 0, run.stderr);
  const json = JSON.parse(run.stdout);
  const s = drive(start);
  await s.press(KEY.down, KEY.right);
  const screen = s.screen();
  assert(line(screen, "Estimate ").startsWith(`Estimate ${pay(json.changed.estimate)}`));
  assert(
    line(screen, "90% sure").includes(
      `+${pay(json.difference.low)} to +${pay(json.difference.high)}`,
    ),
  );
  await s.press("q");
  await s.done;
  await Deno.remove(dir, { recursive: true });
});

Deno.test("a model of a class: shares instead of pay, each class's share on 0% to 100%", async () => {
  const classModel = await fitModel(loadTable(await Deno.readTextFile(demo)), {
    target: "remote",
    trees: 20,
    folds: 3,
    workers: 1,
  });
  const classSession = openModel(classModel);
  const begin = typicalProfile(classModel);
  const term = new xterm.Terminal({ cols: 80, rows: 24, allowProposedApi: true });
  const input = new PassThrough();
  const output = new PassThrough();
  const pending: Promise<void>[] = [];
  output.on("data", (chunk) => pending.push(new Promise((r) => term.write(String(chunk), r))));
  const done = exploreSession(
    { input, output, width: 80, height: 24, style: makeStyle(false), money: {}, ascii: true },
    classSession,
    begin,
  );
  const press = async (key: string) => {
    input.write(key);
    await new Promise((r) => setTimeout(r, 40));
    await Promise.all(pending);
  };
  const screen = () =>
    Array.from({ length: 24 }, (_, i) => term.buffer.active.getLine(i)!.translateToString(true));
  await press(KEY.down);
  await press(KEY.right);
  const moved = applyChanges(classModel, begin, ["level=+1"]).profile;
  const c = estimateProfile(classSession, moved).classes!;
  const shown = screen();
  const likeliest = shown.find((l) => l.includes("Likeliest "))!;
  assert(
    likeliest.includes(`Likeliest ${c.predicted} (${(100 * c.shares[c.predicted]).toFixed(1)}%)`),
    likeliest,
  );
  // One bar per class, under them the 0% to 100% axis.
  for (const name of Object.keys(c.shares)) {
    assert(shown.some((l) => l.startsWith(name) && /\[.*\]/.test(l)), name);
  }
  assert(shown.some((l) => /^\s+0%\s+100%$/.test(l)));
  // An offer is pay: said, not a crash.
  for (const key of ["o", "5", "\r"]) await press(key);
  assert(screen().some((l) => l.includes("An offer is pay")));
  await press("q");
  assert.equal((await done).status, 0);
});

Deno.test("hostile names and levels reach the explore screen as visible text, never as control", async () => {
  const { hostileCsv, RAW_CONTROL, rawControl } = await import("../../e2e/_hostile.ts");
  const hostile = await fitModel(loadTable(await hostileCsv(400)), {
    target: "base_pay_eur",
    trees: 10,
    folds: 3,
    workers: 1,
  });
  const input = new PassThrough();
  const output = new PassThrough();
  let bytes = "";
  output.on("data", (chunk) => (bytes += chunk));
  const done = exploreSession(
    { input, output, width: 80, height: 24, style: makeStyle(false), money: {}, ascii: true },
    openModel(hostile),
    typicalProfile(hostile),
  );
  // Walk every attribute, moving each both ways, so each level's name is drawn.
  for (let i = 0; i < hostile.features.length; i++) {
    for (const key of [KEY.right, KEY.right, KEY.left, KEY.down]) {
      input.write(key);
      await new Promise((r) => setTimeout(r, 5));
    }
  }
  input.write("q");
  await done;
  // What is left once the screen's own sequences are taken out must hold no control.
  // deno-lint-ignore no-control-regex
  const own = /\x1b\[(?:\d+;1H|K|J|H|2J|\?25[lh]|\?1049[lh])/g;
  const left = bytes.replace(own, "");
  assert.equal(rawControl(left), null, "a raw control character reached the screen");
  assert(!RAW_CONTROL.test(left));
  // And the names are there, made visible.
  assert(left.includes("years\\x1b[8m_exp"), "the escaped column name is shown");
});
