// npm run bench: runs every scripts/bench-<area>.ts in turn, each in its own process.
import { spawnSync } from "node:child_process";
import { readdirSync } from "node:fs";

const only = process.argv.slice(2);
const benches = readdirSync("scripts")
  .filter((name) => /^bench-[\w-]+\.ts$/.test(name))
  .filter((name) => only.length === 0 || only.some((area) => name === `bench-${area}.ts`))
  .sort();
let failed = false;
for (const name of benches) {
  console.log(`\n== ${name} ==`);
  const run = spawnSync(process.execPath, ["--import", "tsx", `scripts/${name}`], { stdio: "inherit" });
  if (run.status !== 0) failed = true;
}
process.exit(failed ? 1 : 0);
