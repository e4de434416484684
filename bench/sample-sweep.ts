// `npm run sweep -- --samples [--seed N --n M]`: element identification (analyzeSample against the
// starter table) over M realistic samples from seed N (tests/support/realistic-sample.ts), scored
// against the generator's truth. Prints recall, false present, breakdowns and the worst cases.
import { formatSampleSweep, runSampleSweep } from "../tests/support/sample-sweep";

const args = process.argv.slice(2);
const value = (name: string, fallback: string) => {
  const at = args.indexOf(`--${name}`);
  return at >= 0 && at + 1 < args.length ? args[at + 1] : fallback;
};
const seed = Number(value("seed", "1"));
const n = Number(value("n", "200"));
if (!Number.isInteger(seed) || !Number.isInteger(n) || n < 1) {
  console.error("usage: npm run sweep -- --samples [--seed N --n M]");
  process.exit(2);
}
const records = runSampleSweep({ seed, n });
console.log(formatSampleSweep(records, `sample sweep: seed ${seed}, n ${n}`));
