// Run by tests/e2e/robustness_test.ts with exactly the permissions of the
// `paygrove` task: tries the network two ways and prints what happened.
const outcomes: string[] = [];
try {
  await fetch("http://127.0.0.1:8088/");
  outcomes.push("fetch: allowed");
} catch (error) {
  outcomes.push(`fetch: ${(error as Error).name}`);
}
try {
  const conn = await Deno.connect({ hostname: "127.0.0.1", port: 8088 });
  conn.close();
  outcomes.push("connect: allowed");
} catch (error) {
  outcomes.push(`connect: ${(error as Error).name}`);
}
console.log(outcomes.join("\n"));
