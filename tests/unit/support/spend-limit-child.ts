// Run as a separate process by the shared-limit test: spends N points on one key of a limiter
// through the app's own function and prints how many were allowed.
import { createLimiter, spendLimit } from "~/lib/platform/rate-limit.server";

const [name = "", points = "0", seconds = "60", key = "", spends = "0"] = process.argv.slice(2);
const limiter = createLimiter(name, Number(points), Number(seconds));
const verdicts = await Promise.all(Array.from({ length: Number(spends) }, () => spendLimit(limiter, key)));
console.log(verdicts.filter((v) => v.ok).length);
process.exit(0);
