// One local stand-in service in a process of its own, so that a fault test can take it away
// the hard way (SIGKILL: every connection drops, as when a host or its network dies), bring
// it back on the same port with the same data, or freeze it (SIGSTOP: connections open, no
// answer). Run by service-process.ts:
//   node --import tsx service-child.ts s3 <port> <dir> <bucket>
//   node --import tsx service-child.ts smtp <smtpPort> <httpPort> <dir>
import { startMailCatcher } from "../../../local-services/mail-catcher";
import { startS3Fake } from "../../../local-services/s3-fake";

const [kind, a, b, c] = process.argv.slice(2);
if (kind === "s3") await startS3Fake({ port: Number(a), dir: b!, bucket: c! });
else if (kind === "smtp") await startMailCatcher({ smtpPort: Number(a), httpPort: Number(b), dir: c! });
else throw new Error(`unknown service "${kind}": s3 or smtp`);
console.log("ready");
