/** A progress line on a terminal; nothing at all when the stream is a pipe or a file. */
export interface Progress {
  update(done: number, total: number, label: string): void;
  done(): void;
}

interface TtyLike {
  readonly isTTY?: boolean;
  readonly columns?: number;
  write(s: string): unknown;
}

/**
 * `[██████░░░░░░] 12/20 MX 132`, redrawn in place with a carriage return and erased at the end, so
 * the lines printed afterwards start clean. Only on a TTY: piped output stays free of control codes.
 */
export function progressBar(stream: TtyLike): Progress {
  if (!stream.isTTY) return { update: () => undefined, done: () => undefined };
  let shown = false;
  return {
    update(done, total, label) {
      const width = 24;
      const full = total ? Math.round((done / total) * width) : width;
      const line = `[${'█'.repeat(full)}${'░'.repeat(width - full)}] ${done}/${total} ${label}`;
      stream.write(`\r\x1b[2K${line.slice(0, Math.max(10, (stream.columns ?? 80) - 1))}`);
      shown = true;
    },
    done() {
      if (shown) stream.write('\r\x1b[2K');
    },
  };
}
