/**
 * Progress on standard error, for terminals only (cli-progress). The bar hides the cursor and turns
 * line wrap off while it runs; `stop()` and every exit path (normal exit, an error, SIGINT/SIGTERM:
 * see main.ts) give the terminal back as it was.
 */
import { createRequire } from 'node:module';
import type cliProgressModule from 'cli-progress';
import type { CommandIO } from './io.js';

const RESTORE = '\u001b[?25h\u001b[?7h';
let active = 0;

/** Shows the cursor and turns line wrap back on when a bar was started (safe to call twice). */
export function restoreTerminal(write: (s: string) => void): void {
  if (active > 0) {
    active = 0;
    write(RESTORE);
  }
}

export interface Progress {
  update(value: number, total: number, payload?: Record<string, string | number>): void;
  stop(): void;
}

const NONE: Progress = { update: () => undefined, stop: () => undefined };

/** A bar with `format` (cli-progress tokens), or a no-op when standard error is not a terminal. */
export function progressBar(io: CommandIO, format: string): Progress {
  if (!io.isTTY) return NONE;
  let bar: cliProgressModule.SingleBar | undefined;
  return {
    update(value, total, payload = {}) {
      if (!bar) {
        // cli-progress is loaded on the first bar drawn (terminals only), not at start-up
        const cliProgress = createRequire(import.meta.url)('cli-progress') as typeof cliProgressModule;
        bar = new cliProgress.SingleBar({ format, stream: process.stderr, clearOnComplete: true, hideCursor: true, linewrap: false }, cliProgress.Presets.shades_classic);
        bar.start(Math.max(total, 1), value, payload);
        active++;
        return;
      }
      bar.setTotal(Math.max(total, 1));
      bar.update(value, payload);
    },
    stop() {
      if (!bar) return;
      bar.stop();
      bar = undefined;
      restoreTerminal((s) => io.err(s));
    },
  };
}
