// A progress line on stderr for multi-frame runs: bar, frames, rate and time left. Drawn in
// place on a terminal; on a pipe or file it stays silent (so logs are not flooded).

export class Progress {
  private start = Date.now();
  private last = 0;
  private readonly tty: boolean;

  constructor(private total: number, private label: string, private stream: NodeJS.WriteStream = process.stderr, enabled = true) {
    this.tty = enabled && Boolean(stream.isTTY) && total > 1;
  }

  tick(done: number): void {
    if (!this.tty) return;
    const now = Date.now();
    if (done < this.total && now - this.last < 100) return;
    this.last = now;
    const elapsed = (now - this.start) / 1000;
    const rate = done / Math.max(elapsed, 1e-3);
    const left = rate > 0 ? (this.total - done) / rate : 0;
    const width = 24;
    const filled = Math.round((width * done) / this.total);
    const bar = "#".repeat(filled) + "-".repeat(width - filled);
    this.stream.write(
      `\r${this.label} [${bar}] ${done}/${this.total}  ${rate.toFixed(1)} frames/s  ${formatSeconds(left)} left `,
    );
  }

  done(): void {
    if (this.tty) this.stream.write("\n");
  }
}

export function formatSeconds(s: number): string {
  if (!Number.isFinite(s)) return "?";
  if (s < 60) return `${s.toFixed(0)} s`;
  const m = Math.floor(s / 60);
  return `${m} min ${Math.round(s - 60 * m)} s`;
}
