/** A one-line progress bar on stderr (only when stderr is a terminal; plain lines otherwise, for logs). */
export function progressBar(title: string): (done: number, total: number, label: string) => void {
  return (done, total, label) => {
    const width = 24;
    const filled = total > 0 ? Math.round((done / total) * width) : width;
    const bar = `${title} [${'#'.repeat(filled)}${'-'.repeat(width - filled)}] ${done}/${total} ${label}`;
    if (process.stderr.isTTY) process.stderr.write(`\r${bar.padEnd(process.stderr.columns ?? 80)}${done >= total ? '\n' : ''}`);
    else process.stderr.write(bar + '\n');
  };
}
