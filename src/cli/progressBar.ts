/** A stream the progress bar may draw on (process.stderr or a test double). */
export interface ProgressStream {
  write(s: string): unknown;
  isTTY?: boolean;
  columns?: number;
}

/**
 * A one-line progress bar for the simulation, drawn on stderr only when stderr
 * is a terminal (so redirected output and --json pipelines stay clean).
 * @returns update(done, total) and done() (which erases the bar), or null when not a terminal.
 */
export function createProgressBar(stream: ProgressStream, label: string): { update(done: number, total: number): void; done(): void } | null {
  if (stream.isTTY !== true) return null;
  const width = Math.max(10, Math.min(40, (stream.columns ?? 80) - label.length - 30));
  let lastShown = -1;
  return {
    update(done, total) {
      const share = total > 0 ? done / total : 1;
      const percent = Math.floor(share * 100);
      if (percent === lastShown) return;
      lastShown = percent;
      const filled = Math.round(share * width);
      stream.write(`\r${label} [${'#'.repeat(filled)}${'.'.repeat(width - filled)}] ${String(percent).padStart(3)}% (${done}/${total})`);
    },
    done() {
      stream.write('\r\u001b[K');
    },
  };
}
