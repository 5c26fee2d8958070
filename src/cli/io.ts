/** What a command may touch: passed in, so tests call commands directly and capture output. */
export interface CommandIO {
  readonly cwd: string;
  /** Write to standard output (text is written as given; add your own newline). */
  readonly out: (text: string) => void;
  /** Write to standard error. */
  readonly err: (text: string) => void;
  /** True when standard error is a terminal (progress display allowed). */
  readonly isTTY: boolean;
  /**
   * Width of text output: the terminal's columns when standard output is one (COLUMNS when set),
   * else COLUMNS when set, else 120.
   */
  readonly columns: number;
  /** Aborted on SIGINT/SIGTERM: long runs stop and give what they found so far. */
  readonly signal?: AbortSignal;
}

/** The text width for an output stream (see CommandIO.columns). */
export function textWidth(stdoutColumns: number | undefined, env: NodeJS.ProcessEnv): number {
  const fromEnv = Number(env['COLUMNS']);
  if (Number.isInteger(fromEnv) && fromEnv >= 20) return fromEnv;
  if (stdoutColumns !== undefined && stdoutColumns >= 20) return stdoutColumns;
  return 120;
}

/** An IO that collects everything, for tests. */
export function memoryIO(cwd = process.cwd(), columns = 120, signal?: AbortSignal): CommandIO & { stdout: () => string; stderr: () => string } {
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
    columns,
    ...(signal ? { signal } : {}),
    stdout: () => o,
    stderr: () => e,
  };
}
