/**
 * Where a command writes. The real CLI binds this to the process; tests pass a recorder, so every
 * command runs in-process without touching `process.stdout` or `process.exit`.
 */
export interface CliIo {
  /** Results (text or `--json`). */
  stdout(text: string): void;
  /** Errors and progress. */
  stderr(text: string): void;
  /** True when stdout is a terminal (progress and colour only then). */
  readonly isTty: boolean;
  /** Directory relative paths are resolved against. */
  readonly cwd: string;
}

export function processIo(): CliIo {
  // a closed pipe (`holdfast schema | head`) ends the output, it is not an error
  process.stdout.on('error', (err: NodeJS.ErrnoException) => {
    if (err.code === 'EPIPE') process.exit(0);
    throw err;
  });
  return {
    stdout: (text) => process.stdout.write(text),
    stderr: (text) => process.stderr.write(text),
    isTty: process.stdout.isTTY === true,
    cwd: process.cwd(),
  };
}

/** An in-memory `CliIo` for tests: everything written is kept in `out` and `err`. */
export function memoryIo(cwd: string = process.cwd()): CliIo & { out: string; err: string } {
  const io = {
    out: '',
    err: '',
    isTty: false,
    cwd,
    stdout(text: string) {
      io.out += text;
    },
    stderr(text: string) {
      io.err += text;
    },
  };
  return io;
}
