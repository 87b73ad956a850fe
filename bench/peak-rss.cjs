// Preloaded (`node --require`) into a process the design benchmark times: when the process
// exits it writes its peak resident memory (KiB, the kernel's count for the whole process,
// solver threads included) into the file named by BENCH_PEAK_RSS_FILE.
const fs = require("node:fs");
const { isMainThread } = require("node:worker_threads");

const file = process.env.BENCH_PEAK_RSS_FILE;
if (file && isMainThread) process.on("exit", () => fs.writeFileSync(file, String(process.resourceUsage().maxRSS)));
