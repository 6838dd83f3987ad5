// Source: none needed: help texts (internal behaviour).
/**
 * The help text of the shared options: `--out` names each command's own default folder (the
 * defaults of src/cli/commands/*.ts), and `--fail-if` says it judges the confidence bound in
 * both directions, as src/design/riskGate.ts does.
 */
import { describe, expect, it } from 'vitest';
import { memoryIo } from '../../src/cli/io.js';
import { runCli } from '../../src/cli/program.js';

async function helpOf(command: string): Promise<string> {
  const io = memoryIo();
  expect(await runCli([command, '--help'], io)).toBe(0);
  // commander wraps long descriptions: join the lines so phrases can be matched
  return io.out.replace(/\s+/g, ' ');
}

describe('option help', () => {
  it('gives --out the default folder of each command, never the run default elsewhere', async () => {
    expect(await helpOf('run')).toContain('default results/<case file stem>/');
    const compare = await helpOf('compare');
    expect(compare).toContain('default results/<base>-vs-<variant>/');
    expect(compare).not.toContain('<case file stem>');
    const sweep = await helpOf('sweep');
    expect(sweep).toContain('default results/<case stem>-sweep-<last part of PATH>/');
    expect(sweep).not.toContain('<case file stem>');
    expect(await helpOf('replay')).toContain('default results/<case stem>/replay-<K>/');
  });

  it('says --fail-if judges the upper bound for > and the lower bound for <', async () => {
    for (const command of ['run', 'compare', 'sweep']) {
      const help = await helpOf(command);
      expect(help).toContain('metric>value fails when the upper bound is above value');
      expect(help).toContain('metric<value when the lower bound is below it');
    }
  });
});
