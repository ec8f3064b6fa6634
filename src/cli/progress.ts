/**
 * A progress bar on stderr for long work, drawn only when stderr is a terminal (quiet in pipes,
 * logs and CI) and redrawn at most every 100 ms.
 */
export interface Progress {
  update(done: number, total: number): void;
  done(): void;
}

export function progressBar(label: string, stream: NodeJS.WriteStream = process.stderr): Progress {
  if (!stream.isTTY) return { update: () => undefined, done: () => undefined };
  let last = 0;
  let drawn = false;
  const width = 30;
  return {
    update(done, total) {
      const now = Date.now();
      if (now - last < 100 && done < total) return;
      last = now;
      const f = total > 0 ? Math.min(1, done / total) : 1;
      const fill = Math.round(f * width);
      stream.write(`\r${label} [${'#'.repeat(fill)}${'.'.repeat(width - fill)}] ${Math.round(f * 100)}%`);
      drawn = true;
    },
    done() {
      if (drawn) stream.write('\r\x1b[K');
    },
  };
}
