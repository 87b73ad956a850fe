// A write refused with "database is locked" must not make later writes vanish.
// Reference: SQLite's documented locking in WAL mode (sqlite.org/wal.html, "Concurrency": one
// writer at a time; a second writer waits for the busy timeout, then gets SQLITE_BUSY) and the
// libsql defect report tursodatabase/libsql-client-ts#352 (a busy statement left in progress).
import { createClient, type Client } from "@libsql/client";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterEach, describe, expect, it } from "vitest";
import { isBusyFailure, recoverFromBusy } from "~/db/busy-recovery";

const opened: Client[] = [];
let dir = "";
afterEach(() => {
  for (const c of opened.splice(0)) c.close();
  if (dir) fs.rmSync(dir, { recursive: true, force: true });
});

async function lockedDatabase() {
  dir = fs.mkdtempSync(path.join(os.tmpdir(), "strutwise-busy-"));
  const url = `file:${path.join(dir, "desk.sqlite")}`;
  const setup = createClient({ url });
  opened.push(setup);
  await setup.execute("PRAGMA journal_mode=WAL");
  await setup.execute("create table notes (text text)");
  const holder = createClient({ url });
  const reader = createClient({ url });
  opened.push(holder, reader);
  // another process's write transaction holds the lock
  const lock = await holder.transaction("write");
  await lock.execute("insert into notes values ('held')");
  const seenByOthers = async () => (await reader.execute("select text from notes order by rowid")).rows.map((r) => r.text);
  return { url, lock, seenByOthers };
}

const shortWait = (url: string) => createClient({ url, timeout: 100 });

describe("a busy failure does not swallow later writes", () => {
  it("reproduces the loss on the bare client (so the guard below is needed)", async () => {
    const { url, lock, seenByOthers } = await lockedDatabase();
    const bare = shortWait(url);
    opened.push(bare);
    const refused = await bare.execute("insert into notes values ('refused')").catch((e: unknown) => e);
    expect(isBusyFailure(refused)).toBe(true);
    await lock.rollback();
    await bare.execute("insert into notes values ('after the lock')");
    // the bare client believes it stored the row; nobody else ever sees it
    expect((await bare.execute("select count(*) as n from notes")).rows[0]!.n).toBe(1);
    expect(await seenByOthers()).toEqual([]);
  });

  for (const how of ["execute", "batch", "transaction"] as const) {
    it(`after a busy ${how}, the next write is stored for everyone`, async () => {
      const { url, lock, seenByOthers } = await lockedDatabase();
      const client = recoverFromBusy(shortWait(url));
      opened.push(client);
      const attempt =
        how === "execute"
          ? client.execute("insert into notes values ('refused')")
          : how === "batch"
            ? client.batch(["insert into notes values ('refused')"], "write")
            : client.transaction("write").then(async (tx) => {
                await tx.execute("insert into notes values ('refused')");
                await tx.commit();
              });
      const refused = await attempt.then(() => "stored", (e: unknown) => e);
      expect(isBusyFailure(refused)).toBe(true);
      await lock.rollback();
      await client.execute("insert into notes values ('after the lock')");
      await client.batch(["insert into notes values ('a batch after it')"], "write");
      expect(await seenByOthers()).toEqual(["after the lock", "a batch after it"]);
    });
  }
});
