/**
 * `holdfast init [FILE]`: writes the commented starter case (src/case/starter.ts). Refuses to
 * overwrite an existing file unless `--force`; writes to a temporary name and renames, so a
 * reader never sees half a file.
 */
import { randomBytes } from 'node:crypto';
import { rename, stat, unlink, writeFile } from 'node:fs/promises';
import { resolve } from 'node:path';
import { starterCaseYaml } from '../../case/starter.js';
import { CaseError } from '../../errors.js';
import { exitCode } from '../exit.js';
import type { AddCommand } from '../frame.js';
import { addOptions } from '../options.js';

export const defaultStarterFile = 'case.yaml';

export const addInitCommand: AddCommand = (program, frame) => {
  const cmd = program
    .command('init')
    .argument('[file]', `where to write the starter case (default ${defaultStarterFile})`)
    .summary('write a commented starter case')
    .description(
      'Writes a small, valid, commented case file (invented data) to start from. An existing ' +
        'file is kept unless --force is given.',
    );
  addOptions(cmd, ['force', 'debug']);
  cmd.action(
    frame.action(async ([file], options, io) => {
      const name = file ?? defaultStarterFile;
      const target = resolve(io.cwd, name);
      const existing = await stat(target).catch((err: NodeJS.ErrnoException) => err);
      if (!(existing instanceof Error)) {
        if (existing.isDirectory())
          throw CaseError.single(name, 'expected a file name to write, got a directory');
        if (!options.force)
          throw CaseError.single(
            name,
            'expected a new file, got an existing one; add --force to overwrite it',
          );
      } else if (existing.code !== 'ENOENT') {
        throw CaseError.single(
          name,
          `expected a writable place, got ${existing.code ?? existing.message}`,
        );
      }
      const temporary = `${target}.${randomBytes(4).toString('hex')}.tmp`;
      try {
        await writeFile(temporary, starterCaseYaml(), { encoding: 'utf8', flag: 'wx' });
        await rename(temporary, target);
      } catch (err) {
        // remove a half-written temporary; it may not exist when the write itself failed
        await unlink(temporary).catch((e: NodeJS.ErrnoException) => {
          if (e.code !== 'ENOENT')
            io.stderr(`holdfast: could not remove ${temporary}: ${e.message}\n`);
        });
        const code = (err as NodeJS.ErrnoException).code;
        if (code === 'ENOENT' || code === 'EACCES' || code === 'EROFS' || code === 'ENOTDIR')
          throw CaseError.single(name, `expected a writable place, got ${code}`);
        throw err;
      }
      io.stderr(`holdfast: wrote ${name}; check it with: holdfast check ${name}\n`);
      return exitCode.ok;
    }),
  );
};
