// Reruns tests/reference/sklearn_trees.py (scikit-learn 1.2.1 from Debian's
// python3-sklearn, run with /usr/bin/python3) and requires its output to
// match the committed fixtures in fixtures/reference/: text exactly, numbers
// to a relative 1e-12 (./_compare.ts), since another processor may round
// the last digits differently; the spread over random states by the rule
// below. It takes about a minute, so it runs in CI
// (CI=true) or when PAYGROVE_REFERENCE=1; elsewhere it is skipped with a
// note, and the learner's tests run from the committed fixtures. Where it is
// wanted and scikit-learn is missing, it fails rather than skips.
import assert from "node:assert/strict";
import { assertNoDifferences, type Difference, valueDifferences } from "./_compare.ts";

const root = new URL("../../", import.meta.url).pathname;
const python = "/usr/bin/python3";
const wanted = Deno.env.get("CI") === "true" || Deno.env.get("PAYGROVE_REFERENCE") === "1";

async function sklearnVersion(): Promise<string | undefined> {
  try {
    const probe = await new Deno.Command(python, {
      args: ["-c", "import sklearn; print(sklearn.__version__)"],
      stdout: "piped",
      stderr: "null",
    }).output();
    return probe.success ? new TextDecoder().decode(probe.stdout).trim() : undefined;
  } catch {
    return undefined;
  }
}

interface Case {
  n_leaves: number;
  depth: number;
  node_count: number;
  path: { ccp_alphas: number[] };
  seed_spread: Record<"n_leaves" | "depth" | "node_count" | "path_len", [number, number]>;
}
interface ReferenceFile {
  cases: Case[];
}

// seed_spread is the least and the most over refits with random states 0 to
// 19; which random states land on which shape depends on ties that another
// processor can break the other way (seen: CPS1988 fully grown, 6,356 to
// 6,357 leaves on one machine, 6,357 on all 20 on the one that wrote the
// fixture). So the fresh and committed ranges must overlap and hold the
// random state 0 tree's figures (compared exactly with the rest), not match.
function spreadDifferences(
  cases: Case[],
  fresh: Case["seed_spread"][],
  committed: Case["seed_spread"][],
): Difference[] {
  const out: Difference[] = [];
  cases.forEach((c, i) => {
    const at0 = {
      n_leaves: c.n_leaves,
      depth: c.depth,
      node_count: c.node_count,
      path_len: c.path.ccp_alphas.length,
    };
    for (const key of Object.keys(at0) as (keyof typeof at0)[]) {
      const [a, b] = fresh[i][key];
      const [x, y] = committed[i][key];
      if (Math.max(a, x) > Math.min(b, y) || !(a <= at0[key] && at0[key] <= b)) {
        out.push({
          where: `$.cases[${i}].seed_spread.${key} (ranges overlap and hold ${at0[key]})`,
          fresh: `${a}..${b}`,
          committed: `${x}..${y}`,
        });
      }
    }
  });
  return out;
}

const version = wanted ? await sklearnVersion() : undefined;
if (!wanted) {
  console.warn("sklearn_rerun_test: set PAYGROVE_REFERENCE=1 (CI does) to rerun scikit-learn");
}

Deno.test({
  name: `the tree fixtures match a fresh run of scikit-learn ${version ?? ""}`.trim(),
  ignore: !wanted,
  fn: async () => {
    assert.ok(
      version !== undefined,
      `${python} with scikit-learn is missing: CI must install python3-sklearn (see .ci/run)`,
    );
    const out = await Deno.makeTempDir({ prefix: "paygrove-sklearn-" });
    try {
      const run = await new Deno.Command(python, {
        args: [`${root}tests/reference/sklearn_trees.py`, out],
        stdout: "piped",
        stderr: "piped",
      }).output();
      assert.ok(run.success, new TextDecoder().decode(run.stderr));
      for (const name of ["trees_diabetes.json", "trees_iris.json", "trees_cps1988.json"]) {
        const fresh: ReferenceFile = JSON.parse(await Deno.readTextFile(`${out}/${name}`));
        const committed: ReferenceFile = JSON.parse(
          await Deno.readTextFile(`${root}fixtures/reference/${name}`),
        );
        const spreads = (file: ReferenceFile) =>
          file.cases.map((c) => {
            const spread = c.seed_spread;
            delete (c as Partial<Case>).seed_spread;
            return spread;
          });
        const freshSpreads = spreads(fresh);
        const committedSpreads = spreads(committed);
        assertNoDifferences(`fixtures/reference/${name}`, [
          ...valueDifferences(fresh, committed),
          ...spreadDifferences(committed.cases, freshSpreads, committedSpreads),
        ]);
      }
    } finally {
      await Deno.remove(out, { recursive: true });
    }
  },
});
