// The README's demo: `rankfloor check` over the bundled examples with the bundled policies, then
// `rankfloor bounds` on three of them (one a training config that names an architecture definition). The trimmed kidney-pair config fails its policy on purpose;
// the demo exits 0 when exactly that happens and passes any other outcome on as an error.
import { run } from '../build/cli/run.js';

const io = {
  stdout: (t) => process.stdout.write(t),
  stderr: (t) => process.stderr.write(t),
  color: process.stdout.isTTY === true && !process.env.NO_COLOR,
};

process.stdout.write('$ rankfloor check --policy policies/\n');
const checked = await run(['check', '--policy', 'policies/'], io);
let failed = false;
if (checked === 1) {
  process.stdout.write('\n(exit 1 is expected: examples/renal-pair-net-trimmed.yaml was trimmed on purpose and fails paired-organ-scans)\n');
} else {
  process.stderr.write(`demo: expected exit 1 from check (one planted failure), got ${checked}\n`);
  failed = true;
}
for (const args of [
  ['bounds', 'examples/renal-pair-net.yaml'],
  ['bounds', 'examples/probe-ring.yaml', '--partition', 'start-end', '--partition', 'interleaved'],
  ['bounds', 'examples/train/seedling-tray-compact.yaml', '--partition', 'left-right', '--partition', 'top-bottom'],
]) {
  process.stdout.write(`\n$ rankfloor ${args.join(' ')}\n`);
  if ((await run(args, io)) !== 0) failed = true;
}
process.exitCode = failed ? 2 : 0;
