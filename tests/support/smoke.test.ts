import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { startTestServices, type TestServices } from "./services";

let svc: TestServices;
beforeAll(async () => {
  svc = await startTestServices();
});
afterAll(async () => svc?.stop());

describe("local services", () => {
  it("stores and reads an object through the AWS SDK, and catches a mail through nodemailer", async () => {
    const { putObject, getText } = await import("~/lib/storage.server");
    const { sendMail } = await import("~/lib/mail.server");
    const { db } = await import("~/db/client.server");
    const { migrateDb } = await import("~/db/migrate.server");
    await migrateDb(db());
    await putObject("probe/a.txt", "hello truss", "text/plain");
    expect(await getText("probe/a.txt")).toBe("hello truss");
    expect(await getText("probe/missing.txt")).toBeNull();
    await sendMail({ to: "checker@example.test", subject: "Probe", text: "body" });
    const msgs = svc.mail.messages();
    expect(msgs).toHaveLength(1);
    expect(msgs[0]).toMatchObject({ subject: "Probe", to: ["checker@example.test"] });
  });
});
