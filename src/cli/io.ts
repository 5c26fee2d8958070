/** What a command may touch: passed in, so tests call commands directly and capture output. */
export interface CommandIO {
  readonly cwd: string;
  /** Write to standard output (text is written as given; add your own newline). */
  readonly out: (text: string) => void;
  /** Write to standard error. */
  readonly err: (text: string) => void;
  /** True when standard error is a terminal (progress bars allowed). */
  readonly isTTY: boolean;
}

/** An IO that collects everything, for tests. */
export function memoryIO(cwd = process.cwd()): CommandIO & { stdout: () => string; stderr: () => string } {
  let o = '';
  let e = '';
  return {
    cwd,
    out: (t) => {
      o += t;
    },
    err: (t) => {
      e += t;
    },
    isTTY: false,
    stdout: () => o,
    stderr: () => e,
  };
}
