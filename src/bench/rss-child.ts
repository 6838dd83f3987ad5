/**
 * Child process of `peakRssMb` (pool.ts): runs `argv[2]` (case) for `argv[3]` scenarios into
 * `argv[4]` and prints `{"peakRssMb": ...}` from the kernel's max-RSS counter (which covers the
 * worker threads of this process).
 */
import { loadCase } from '../case/load.js';
import { runAssessment } from '../run/run.js';

const [casePath, n, outDir] = process.argv.slice(2);
const loaded = await loadCase(casePath!);
await runAssessment(loaded, { outDir: outDir!, scenarios: Number(n) });
// resourceUsage().maxRSS is in kilobytes (Node docs, process.resourceUsage)
process.stdout.write(`${JSON.stringify({ peakRssMb: process.resourceUsage().maxRSS / 1024 })}\n`);
