import assert from "node:assert/strict";
import { DataError } from "../../../lib/errors.ts";
import { readTextBounded } from "../../../lib/io/read_bounded.ts";

const options = { maxBytes: 1000, what: "model file" };

function tempWith(bytes: string | Uint8Array): string {
  const path = Deno.makeTempFileSync({ suffix: ".json" });
  if (typeof bytes === "string") Deno.writeTextFileSync(path, bytes);
  else Deno.writeFileSync(path, bytes);
  return path;
}

async function refusal(path: string, opts = options): Promise<DataError> {
  try {
    await readTextBounded(path, opts);
  } catch (error) {
    assert.ok(error instanceof DataError, String(error));
    return error;
  }
  assert.fail("was read");
}

Deno.test("a JSON file is read whole, leading spaces and UTF-8 included", async () => {
  const text = ' \n\t{"name":"Zoë","pay":[1,2]}\n';
  assert.equal(await readTextBounded(tempWith(text), options), text);
});

Deno.test("a file of exactly the bound is read; one byte more is refused", async () => {
  const text = `{"x":"${"a".repeat(92)}"}`; // 7 + 92 + 1 = 100 bytes
  assert.equal(new TextEncoder().encode(text).length, 100);
  const path = tempWith(text);
  assert.equal(await readTextBounded(path, { maxBytes: 100, what: "model file" }), text);
  const error = await refusal(path, { maxBytes: 99, what: "model file" });
  assert.equal(error.message, `${path} is larger than 99 bytes: not a paygrove model file`);
  assert.equal(error.location.file, path);
});

Deno.test("a bound in whole MiB is said in MiB; a file over 1 MiB is read in pieces", async () => {
  // 1 MiB + 10 bytes: two pieces.
  const body = "x".repeat(2 ** 20);
  const text = `{"a":"${body}"}`;
  const path = tempWith(text);
  assert.equal(
    (await readTextBounded(path, { maxBytes: 2 ** 21, what: "model file" })).length,
    text.length,
  );
  const error = await refusal(path, { maxBytes: 2 ** 20, what: "analyst's file" });
  assert.equal(error.message, `${path} is larger than 1 MiB: not a paygrove analyst's file`);
});

Deno.test("an empty file is read as empty text (the JSON reader then says what is wrong)", async () => {
  assert.equal(await readTextBounded(tempWith(""), options), "");
  assert.equal(await readTextBounded(tempWith("  \n"), options), "  \n");
});

Deno.test("text that does not start as a JSON object is refused at its first piece", async () => {
  for (const text of ["id,pay\n1,2\n", "[1,2]", '"{"', "\uFEFF{}"]) {
    const path = tempWith(text);
    assert.equal((await refusal(path)).message, `${path} is not a paygrove model file`);
  }
});

Deno.test("a NUL byte in the first piece, or bytes that are not UTF-8, are refused", async () => {
  const nul = tempWith(Uint8Array.of(0x7b, 0x00, 0x7d));
  assert.equal((await refusal(nul)).message, `${nul} is not a paygrove model file`);
  const latin1 = tempWith(Uint8Array.of(0x7b, 0x22, 0xe9, 0x22, 0x7d)); // {"é"} in Latin-1
  assert.equal(
    (await refusal(latin1)).message,
    `${latin1} is not a paygrove model file (not UTF-8 text)`,
  );
});

Deno.test("a missing file, a folder and a device are refused with their own words", async () => {
  const folder = Deno.makeTempDirSync();
  const missing = `${folder}/none.json`;
  assert.equal((await refusal(missing)).message, `${missing}: no such model file`);
  assert.equal((await refusal(folder)).message, `${folder} is a folder, not a model file`);
  // /dev/zero never ends; its first piece is NUL bytes.
  assert.equal((await refusal("/dev/zero")).message, "/dev/zero is not a paygrove model file");
  // A path through a regular file cannot be opened (ENOTDIR): said as a read problem.
  const file = tempWith("{}");
  assert.match((await refusal(`${file}/x.json`)).message, /: cannot read it \(/);
});
