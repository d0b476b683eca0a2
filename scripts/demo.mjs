// The README's demo: bounds for every bundled example, through the built CLI's `run`.
import { run } from '../build/cli/run.js';

const io = { stdout: (t) => process.stdout.write(t), stderr: (t) => process.stderr.write(t) };
const jobs = [
  ['bounds', 'examples/renal-pair-net.yaml'],
  ['bounds', 'examples/renal-pair-net-trimmed.yaml'],
  ['bounds', 'examples/gait-sequence.yaml'],
  ['bounds', 'examples/weave-defects-training.yaml', '--model-path', '/experiment/network'],
  ['bounds', 'examples/probe-ring.yaml', '--partition', 'start-end', '--partition', 'interleaved'],
];
let worst = 0;
for (const args of jobs) {
  process.stdout.write(`\n$ rankfloor ${args.join(' ')}\n`);
  worst = Math.max(worst, await run(args, io));
}
process.exitCode = worst;
