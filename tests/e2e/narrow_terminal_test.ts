// One command end to end on a pseudo-terminal 60 columns wide (util-linux
// `script`, `stty cols 60`): no line of what it prints is longer than 60
// columns, and the figures of its tables appear whole.
import assert from "node:assert/strict";
import { HAS_SCRIPT, paygrove, ROOT, taskArgs, taskEnv } from "./_cli.ts";
import { formatPay, formatPercent } from "../../tui/render/numbers.ts";

// deno-lint-ignore no-control-regex
const ANSI = /\x1b\[[0-9;?]*[A-Za-z]/g;

async function onNarrowTerminal(
  args: string[],
  columns: number,
  status = 0,
): Promise<string[]> {
  const command = ["deno", ...taskArgs("paygrove"), ...args].map((w) => `'${w}'`).join(" ");
  const output = await new Deno.Command("script", {
    args: ["-qec", `stty cols ${columns} rows 200; NO_COLOR=1 ${command}`, "/dev/null"],
    cwd: ROOT,
    env: {
      PATH: `${Deno.execPath().replace(/\/[^/]+$/, "")}:${Deno.env.get("PATH")}`,
      TERM: "xterm-256color",
      ...taskEnv("paygrove"),
    },
    stdout: "piped",
    stderr: "piped",
  }).output();
  assert.equal(output.code, status, new TextDecoder().decode(output.stdout));
  // What the screen shows: a progress line redrawn with a carriage return
  // leaves only its last state.
  return new TextDecoder().decode(output.stdout).replace(ANSI, "").split(/\r?\n/)
    .map((l) => l.split("\r").at(-1)!);
}

Deno.test({
  name: "schema on a 60-column terminal: no line wider, every column named whole",
  ignore: !HAS_SCRIPT && Deno.env.get("CI") !== "true",
  fn: async () => {
    const lines = await onNarrowTerminal(["schema", "fixtures/demo_company.csv"], 60);
    const long = lines.filter((l) => l.length > 60);
    assert.deepEqual(long, [], long.join("\n"));
    for (const name of ["employee_id", "years_experience", "performance_rating", "base_pay_eur"]) {
      assert.ok(lines.some((l) => l.includes(name)), name);
    }
    // The pay range appears whole on one line.
    assert.ok(lines.some((l) => /\d[\d,.]*\s*(to|-)\s*\d/.test(l)), lines.join("\n"));
  },
});

// No line wider than the screen, every figure whole on some line, and every
// column a table left out named in a note (with where to find it).
function fitsScreen(lines: string[], width: number, figures: string[]): void {
  const long = lines.filter((l) => l.length > width);
  assert.deepEqual(long, [], `lines longer than ${width}:\n${long.join("\n")}`);
  for (const figure of new Set(figures)) {
    assert.ok(
      lines.some((l) => l.includes(figure)),
      `${figure} is not whole on one line at ${width} columns:\n${lines.join("\n")}`,
    );
  }
}

// Whether a note says this column was left out or shortened (and that --json has it).
function saysLeftOut(lines: string[], column: string): boolean {
  const text = lines.join(" ").replace(/\s+/g, " ");
  return new RegExp(`${column}[^.]*(left out|shortened)[^.]*--json`).test(text);
}

const ON_TERMINAL = { ignore: !HAS_SCRIPT && Deno.env.get("CI") !== "true" };
const DEMO = "fixtures/demo_company.csv";
const EUR = { currency: "EUR" };
const READ = ["--target", "base_pay_eur", "--currency", "EUR", "--period", "base_pay_eur=year"];
const dir = await Deno.makeTempDir({ prefix: "paygrove_narrow_" });
const modelFile = `${dir}/demo.model.json`;

// deno-lint-ignore no-explicit-any
async function json(args: string[]): Promise<Record<string, any>> {
  const run = await paygrove([...args, "--json"]);
  assert.equal(run.code, 0, run.stderr);
  return JSON.parse(run.stdout);
}

// The figures of the gap table, the sentence and the quartiles as the
// screen writes them (a share of 0.1234 as 12.3%; what rounds to 0 as 0.0%).
const share = (x: number) => formatPercent(Math.abs(x) < 0.0005 ? 0 : x);

Deno.test({
  ...ON_TERMINAL,
  name:
    "gap by gender within job family at 60 and 80 columns: figures whole, left-out columns said",
  fn: async () => {
    const args = ["gap", DEMO, ...READ, "--group", "gender", "--within", "job_family"];
    const doc = await json(args);
    const gaps = [doc.overall, ...doc.categories].filter((c) => !c.suppressed)
      .flatMap((c) => c.gaps);
    assert.ok(gaps.length >= 6, "the demo has figures to show");
    for (const width of [60, 80]) {
      const lines = await onNarrowTerminal(args, width);
      fitsScreen(lines, width, [
        ...gaps.flatMap((g) => [share(g.rawMean), share(g.adjusted)]),
        ...doc.quartiles.flatMap((q: { shares: Record<string, number> }) =>
          Object.values(q.shares).map(share)
        ),
      ]);
      for (const g of gaps) {
        const median = lines.some((l) => l.includes(share(g.rawMedian)));
        assert.ok(median || saysLeftOut(lines, "median"), `median ${g.rawMedian} at ${width}`);
        const counts = lines.some((l) => l.includes(`${g.rows}/${g.referenceRows}`));
        assert.ok(counts || saysLeftOut(lines, "people"), `counts of ${g.group} at ${width}`);
      }
    }
  },
});

Deno.test({
  ...ON_TERMINAL,
  name: "review within job family at 60 and 80 columns: listed people's figures whole",
  fn: async () => {
    const args = ["review", DEMO, ...READ, "--within", "job_family"];
    const doc = await json(args);
    const pay = (x: number) => formatPay(x, EUR, true);
    const under = doc.people.filter((p: { status: string }) => p.status === "under")
      .sort((a: { position: number }, b: { position: number }) => a.position - b.position)
      .slice(0, 10);
    assert.equal(under.length, 10);
    for (const width of [60, 80]) {
      const lines = await onNarrowTerminal(args, width);
      fitsScreen(lines, width, [
        ...doc.categories.flatMap((c: { people: number; cost: number }) => [pay(c.cost)]),
        pay(doc.overall.cost),
        ...under.flatMap((
          p: { id: string; pay: number; low: number; high: number; position: number },
        ) => [
          `${p.id} `,
          pay(p.pay),
          pay(p.low),
          pay(p.high),
          formatPercent(p.position),
        ]),
      ]);
      for (const p of under) {
        const shown = lines.some((l) => l.includes(pay(p.estimate)));
        assert.ok(shown || saysLeftOut(lines, "estimate"), `estimate of ${p.id} at ${width}`);
      }
    }
  },
});

const fitted = HAS_SCRIPT
  ? await paygrove(["fit", DEMO, ...READ, "--out", modelFile])
  : { code: 0, stderr: "" };
if (fitted.code !== 0) throw new Error(`fit failed: ${fitted.stderr}`);

Deno.test({
  ...ON_TERMINAL,
  name: "inspect with tree and importance at 60 and 80 columns: accuracy, hash and tree whole",
  fn: async () => {
    const args = ["inspect", modelFile, "--tree", "--importance"];
    const doc = await json(args);
    const q = doc.quality;
    const accuracy = [q.constant, q.linear, q.reference, q.ensemble];
    const pay = (x: number) => formatPay(x, EUR);
    for (const width of [60, 80]) {
      const lines = await onNarrowTerminal(args, width);
      fitsScreen(lines, width, [
        ...accuracy.map((a) => pay(a.money.rmse)),
        ...doc.referenceTree.outline.filter((n: { value: number | null }) => n.value !== null)
          .map((n: { value: number }) => pay(n.value)),
      ]);
      for (const a of accuracy) {
        const mae = lines.some((l) => l.includes(pay(a.money.mae)));
        assert.ok(mae || saysLeftOut(lines, "MAE"), `MAE ${a.money.mae} at ${width}`);
      }
      const sha = doc.provenance.table.sha256;
      assert.ok(
        lines.some((l) => l.includes(sha)) ||
          (lines.some((l) => l.includes(sha.slice(0, 12))) && saysLeftOut(lines, "sha256")),
        `the table's sha256 at ${width}`,
      );
    }
  },
});

Deno.test({
  ...ON_TERMINAL,
  name: "estimate with an offer at 60 and 80 columns: no line wider, figures whole",
  fn: async () => {
    const args = ["estimate", modelFile, "--set", "level=G3", "--offer", "61k"];
    const doc = await json(args);
    const pay = (x: number) => formatPay(x, EUR);
    for (const width of [60, 80]) {
      const lines = await onNarrowTerminal(args, width);
      fitsScreen(lines, width, [
        pay(doc.estimate),
        pay(doc.range.low),
        pay(doc.range.high),
        pay(doc.confidence.low),
        pay(doc.confidence.high),
      ]);
    }
  },
});

Deno.test({
  ...ON_TERMINAL,
  name: "batch on a terminal at 60 and 80 columns: each row's figures whole",
  fn: async () => {
    // Twenty demo people, their own pay as the offer, and one level the model never saw.
    const text = (await Deno.readTextFile(`${ROOT}${DEMO}`)).split("\n");
    const rows = text.slice(1, 21);
    rows.push(rows[0].replace(/^FH\d+/, "FH19999").replace(/,G\d,/, ",G9,"));
    assert.ok(rows.at(-1)!.includes(",G9,"), rows.at(-1));
    const file = `${dir}/people.csv`;
    await Deno.writeTextFile(file, [text[0], ...rows].join("\n") + "\n");
    const args = ["batch", modelFile, file, "--offer", "base_pay_eur"];
    const run = await paygrove([...args, "--json"]);
    assert.equal(run.code, 3, run.stderr);
    const doc = JSON.parse(run.stdout);
    const pay = (x: number) => formatPay(x, EUR);
    const scored = doc.rows.filter((r: { estimate: number | null }) => r.estimate !== null);
    assert.equal(scored.length, 20);
    for (const width of [60, 80]) {
      const lines = await onNarrowTerminal(args, width, 3);
      const range = lines.some((l) => l.includes(" - €")) || saysLeftOut(lines, "range");
      assert.ok(range, `the ranges at ${width}`);
      fitsScreen(lines, width, [
        ...scored.flatMap((r: { estimate: number; rangeLow: number; rangeHigh: number }) => [
          pay(r.estimate),
          ...(saysLeftOut(lines, "range") ? [] : [pay(r.rangeLow), pay(r.rangeHigh)]),
        ]),
        ...scored.map((r: { rangePosition: number }) => r.rangePosition.toFixed(2)),
      ]);
      // The closing line on stderr: the table's SHA-256 whole, or shortened and said.
      const sha = doc.provenance.table.sha256;
      assert.ok(
        lines.some((l) => l.includes(sha)) ||
          (lines.some((l) => l.includes(sha.slice(0, 12))) && saysLeftOut(lines, "sha256")),
        `the table's sha256 at ${width}`,
      );
    }
  },
});

Deno.test({
  ...ON_TERMINAL,
  name: "bands by level at 60 and 80 columns: no line wider, each band's ends whole",
  fn: async () => {
    const args = ["bands", modelFile, "--table", DEMO];
    const doc = await json(args);
    const pay = (x: number) => formatPay(x, EUR);
    for (const width of [60, 80]) {
      const lines = await onNarrowTerminal(args, width);
      fitsScreen(
        lines,
        width,
        doc.cells.flatMap((c: { band: { min: number; max: number } }) => [
          pay(c.band.min),
          pay(c.band.max),
        ]),
      );
      // What the table left out at this width is said.
      for (const column of ["p25", "p75"]) {
        const shown = lines.some((l) => /\bp25\b/.test(l) && /\bp75\b/.test(l));
        assert.ok(shown || saysLeftOut(lines, column), `${column} at ${width}`);
      }
    }
  },
});
