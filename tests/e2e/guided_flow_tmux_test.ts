// The guided flow in a real pseudo-terminal: tmux runs `deno task start`,
// keys walk it (demo data -> fit -> typical person -> promote one level ->
// quit), waiting for each screen with a bounded timeout, and the figures on
// screen must equal `paygrove compare --json` on the same model and profile,
// as formatted. Runs where tmux is installed; CI installs it and fails here
// if it is missing.
import assert from "node:assert/strict";
import { formatPay, formatPercent } from "../../tui/render/numbers.ts";
import { paygrove, ROOT } from "./_cli.ts";
import { eightAttributeCsv } from "../tui/_eight_attributes.ts";

const HAS_TMUX = await new Deno.Command("tmux", { args: ["-V"], stdout: "null", stderr: "null" })
  .output().then((o) => o.success, () => false);
const IN_CI = Deno.env.get("CI") === "true";
const TREES = "60";

async function tmux(...args: string[]): Promise<string> {
  const out = await new Deno.Command("tmux", { args, stdout: "piped", stderr: "piped" }).output();
  if (!out.success) {
    throw new Error(`tmux ${args.join(" ")}: ${new TextDecoder().decode(out.stderr)}`);
  }
  return new TextDecoder().decode(out.stdout);
}

Deno.test({
  name: "tmux: demo data, fit, typical person, promote one level, quit",
  ignore: !HAS_TMUX && !IN_CI,
  fn: async () => {
    assert.ok(HAS_TMUX, "tmux is missing: .ci/run installs it");
    const session = `paygrove-${crypto.randomUUID().slice(0, 8)}`;
    const deno = Deno.execPath();
    await tmux(
      "new-session",
      "-d",
      "-s",
      session,
      "-x",
      "80",
      "-y",
      "40",
      "-c",
      ROOT,
      `NO_COLOR=1 ${deno} task start --trees ${TREES}; sleep 30`,
    );
    let keys = 0;
    const started = performance.now();
    const screen = () => tmux("capture-pane", "-p", "-J", "-S", "-400", "-t", session);
    let seen = 0;
    const when = async (text: string, ...send: string[]) => {
      const deadline = performance.now() + 90_000;
      for (;;) {
        const now = await screen();
        const at = now.indexOf(text, seen);
        if (at >= 0) {
          seen = at + 1;
          break;
        }
        if (performance.now() > deadline) {
          throw new Error(`the screen never showed "${text}"; it shows:\n${now.slice(-1500)}`);
        }
        await new Promise((resolve) => setTimeout(resolve, 100));
      }
      for (const key of send) {
        await tmux("send-keys", "-t", session, key);
        keys++;
      }
    };
    try {
      await when("What do you want to work with?", "Enter");
      await when("Which column should paygrove estimate?", "Enter");
      await when("Which attributes may explain it?", "Enter");
      await when("Check for pay gaps between groups first?", "Enter");
      await when("Start the profile from", "Enter");
      await when("What next?", "Down", "Enter");
      await when("Decision path: condition");
      const seconds = (performance.now() - started) / 1000;
      const shown = await screen();
      await when("What next?", "Up", "Enter");
      await when("Done.");
      console.log(`walk: ${keys} keystrokes, ${seconds.toFixed(1)} s to the promotion's answer`);

      // The same model and profile through the scriptable commands.
      const dir = await Deno.makeTempDir();
      const model = `${dir}/m.json`;
      const fit = await paygrove([
        "fit",
        "fixtures/demo_company.csv",
        "--target",
        "base_pay_eur",
        "--currency",
        "EUR",
        "--period",
        "base_pay_eur=year",
        "--trees",
        TREES,
        "--out",
        model,
      ]);
      assert.equal(fit.code, 0, fit.stderr);
      const compare = await paygrove(["compare", model, "--change", "level=+1", "--json"]);
      assert.equal(compare.code, 0, compare.stderr);
      const doc = JSON.parse(compare.stdout);
      const pay = (x: number) => formatPay(x, { currency: "EUR" });
      const d = doc.difference;
      const line = `Change: +${pay(d.estimate)} (${formatPercent(d.relative.estimate, true)}) ` +
        `(90%: +${pay(d.low)} to +${pay(d.high)}`;
      assert.ok(shown.includes(line), `screen lacks "${line}":\n${shown.slice(-2000)}`);
      assert.ok(
        shown.includes(`changed │ ${pay(doc.changed.estimate).padStart(8)}`) ||
          shown.includes(pay(doc.changed.estimate)),
      );
      assert.ok(shown.includes(pay(doc.base.estimate)));
      await Deno.remove(dir, { recursive: true });
    } finally {
      await tmux("kill-session", "-t", session).catch(() => {});
    }
  },
});

// The same on an 80 x 24 terminal (its own tmux server, socket "flow80"),
// with a table of 6,000 invented people and eight attributes whose typical
// person has a profile of two lines and a 7-condition path: when each
// question is asked, what it follows is still on screen.
Deno.test({
  name: "tmux 80 x 24: the fit's answer, the result and a sweep's chart stay above the question",
  ignore: !HAS_TMUX && !IN_CI,
  fn: async () => {
    assert.ok(HAS_TMUX, "tmux is missing: .ci/run installs it");
    const dir = await Deno.makeTempDir();
    const table = `${dir}/eight.csv`;
    await Deno.writeTextFile(table, eightAttributeCsv());
    const own = (...args: string[]) => tmux("-L", "flow80", ...args);
    const session = `paygrove-${crypto.randomUUID().slice(0, 8)}`;
    await own(
      "new-session",
      "-d",
      "-s",
      session,
      "-x",
      "80",
      "-y",
      "24",
      "-c",
      ROOT,
      `NO_COLOR=1 ${Deno.execPath()} task start --trees 30; sleep 30`,
    );
    // The 24 lines in view, and everything so far.
    const pane = async () => (await own("capture-pane", "-p", "-t", session)).split("\n");
    const history = () => own("capture-pane", "-p", "-J", "-S", "-400", "-t", session);
    let seen = 0;
    const when = async (text: string, ...send: string[]) => {
      const deadline = performance.now() + 90_000;
      for (;;) {
        const now = await history();
        const at = now.indexOf(text, seen);
        if (at >= 0) {
          seen = at + 1;
          break;
        }
        if (performance.now() > deadline) {
          throw new Error(`the screen never showed "${text}"; it shows:\n${now.slice(-1500)}`);
        }
        await new Promise((resolve) => setTimeout(resolve, 100));
      }
      // Let the prompt finish drawing.
      await new Promise((resolve) => setTimeout(resolve, 300));
      for (const key of send) await own("send-keys", "-t", session, key);
    };
    const inView = (view: string[], start: string | RegExp) =>
      assert.ok(
        view.some((l) => typeof start === "string" ? l.startsWith(start) : start.test(l)),
        `not in view: ${start}\n--- the 24 lines in view ---\n${view.join("\n")}`,
      );
    try {
      await when("What do you want to work with?", "Down", "Enter");
      await when("Path of the CSV file:");
      await own("send-keys", "-t", session, "-l", table);
      await own("send-keys", "-t", session, "Enter");
      await when("Which column should paygrove estimate?", "Enter");
      await when("Which attributes may explain it?", "Enter");
      await when("Start the profile from");
      const fitted = await pane();
      inView(fitted, "In short:");
      inView(fitted, /matters most\.$/);
      await own("send-keys", "-t", session, "Enter");
      await when("What next?");
      const result = await pane();
      inView(result, "Estimate of pay:");
      inView(result, /^ +\.\.\. \d more conditions$/);
      inView(result, "  Quit");
      await own("send-keys", "-t", session, "Down", "Down", "Enter");
      await when("Sweep which attribute?", "Down", "Enter");
      await when("Estimate as grade varies");
      await when("What next?");
      const sweep = await pane();
      inView(sweep, "Estimate as grade varies");
      assert.ok(sweep.filter((l) => /[┤┼]/.test(l)).length >= 6, sweep.join("\n"));
      inView(sweep, /^ +G1 +G7$/);
      inView(sweep, "  Quit");
      await own("send-keys", "-t", session, "Up", "Enter");
      await when("Done.");
    } finally {
      await own("kill-session", "-t", session).catch(() => {});
      await Deno.remove(dir, { recursive: true });
    }
  },
});
