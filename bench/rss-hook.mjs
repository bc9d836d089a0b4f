// Preloaded with `node --import`: prints the process's peak resident set size (KiB) and its CPU
// time (ms, every thread) on exit.
process.on('exit', () => {
  const u = process.resourceUsage();
  process.stderr.write(`\nSTEPLENS_BENCH_MAXRSS ${u.maxRSS} CPU ${Math.round((u.userCPUTime + u.systemCPUTime) / 1000)}\n`);
});
