// Preloaded (`node --require`) into a process the design benchmark times: when the process
// exits it writes its peak resident memory (KiB) and the CPU time it used (seconds, user and
// system, solver threads included), the kernel's counts for the whole process, as JSON into the
// file named by BENCH_PROCESS_USAGE_FILE.
const fs = require("node:fs");
const { isMainThread } = require("node:worker_threads");

const file = process.env.BENCH_PROCESS_USAGE_FILE;
if (file && isMainThread) {
  process.on("exit", () => {
    const u = process.resourceUsage();
    fs.writeFileSync(file, JSON.stringify({ peakKiB: u.maxRSS, cpuSeconds: (u.userCPUTime + u.systemCPUTime) / 1e6 }));
  });
}
