// /api/health really touches the database, the bucket and the mail server (issue 2), so it
// must turn red, with words, when one of them is gone.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { startTestServices, type TestServices } from "../support/services";

let svc: TestServices;
let loader: () => Promise<Response>;

beforeAll(async () => {
  svc = await startTestServices();
  ({ loader } = await import("~/routes/api/health"));
});
afterAll(async () => svc?.stop());

describe("/api/health", () => {
  it("answers 200 with every dependency ok", async () => {
    const res = await loader();
    expect(res.status).toBe(200);
    expect(res.headers.get("cache-control")).toBe("no-store");
    expect(await res.json()).toEqual({ db: "ok", storage: "ok", mail: "ok" });
  });

  it("answers 503 naming the storage fault when the S3 service is down, the rest still ok", async () => {
    await svc.s3.stop();
    const res = await loader();
    expect(res.status).toBe(503);
    const body = (await res.json()) as Record<string, string>;
    expect(body.db).toBe("ok");
    expect(body.mail).toBe("ok");
    expect(body.storage).not.toBe("ok");
    expect(body.storage).toContain(svc.env.S3_BUCKET);
    expect(body.storage).not.toMatch(/\n\s+at /); // words, not a stack trace
  });

  it("answers 503 naming the mail fault when the SMTP server is down", async () => {
    await svc.mail.stop();
    const res = await loader();
    expect(res.status).toBe(503);
    const body = (await res.json()) as Record<string, string>;
    expect(body.db).toBe("ok");
    expect(body.mail).not.toBe("ok");
    expect(body.mail).toContain(svc.env.SMTP_PORT);
  });
});
