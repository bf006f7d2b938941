// One-line progress text for the command line: bytes, rate and time left.

export function formatBytes(bytes: number): string {
  if (bytes < 1024) return `${bytes} B`;
  const units = ['KiB', 'MiB', 'GiB', 'TiB'];
  let v = bytes / 1024;
  let i = 0;
  while (v >= 1024 && i < units.length - 1) { v /= 1024; i++; }
  return `${v.toFixed(1)} ${units[i]}`;
}

export function formatDuration(seconds: number): string {
  if (seconds < 1) return `${Math.round(seconds * 1000)} ms`;
  if (seconds < 60) return `${seconds.toFixed(1)} s`;
  return `${Math.floor(seconds / 60)} min ${Math.round(seconds % 60)} s`;
}

export function progressLine(done: number, total: number, elapsedSeconds: number): string {
  const fraction = total > 0 ? Math.min(1, done / total) : 0;
  const rate = elapsedSeconds > 0 ? done / elapsedSeconds : 0;
  const left = rate > 0 ? (total - done) / rate : 0;
  const width = 24;
  const filled = Math.round(fraction * width);
  return `[${'#'.repeat(filled)}${'.'.repeat(width - filled)}] ${(fraction * 100).toFixed(0)}% ${formatBytes(done)} of ${formatBytes(total)}, ${formatBytes(rate)}/s, ${formatDuration(left)} left`;
}
