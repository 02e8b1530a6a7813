// The repository's TypeScript sources read from disk, for the tests that
// check rules on the code itself (tests/layers_test.ts, tests/doc_examples_test.ts).

const root = new URL("../", import.meta.url).pathname;

/** Every .ts file under `dir` (relative to the repository), sorted by path. */
export async function sources(
  dir: string,
  keep: (name: string) => boolean = (name) => name.endsWith(".ts"),
): Promise<{ path: string; text: string }[]> {
  const out: { path: string; text: string }[] = [];
  for await (const entry of Deno.readDir(`${root}${dir}`)) {
    const path = `${dir}/${entry.name}`;
    if (entry.isDirectory) out.push(...await sources(path, keep));
    else if (keep(entry.name)) out.push({ path, text: await Deno.readTextFile(`${root}${path}`) });
  }
  return out.sort((a, b) => (a.path < b.path ? -1 : 1));
}

/** The repository's root directory, ending in "/". */
export const ROOT = root;
