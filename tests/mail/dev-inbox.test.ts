// The development inbox page reads the mail catcher's HTTP API: an admin sees the mail the
// desk sent; outside NODE_ENV=development other roles are refused (route-access.ts).
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { makeUser, req, sessionCookie, setup } from "../auth/helpers";

let ctx: Awaited<ReturnType<typeof setup>>;
let page: typeof import("~/routes/dev.inbox");
let adminCookie: string;
let engineerCookie: string;

async function load(cookie?: string): Promise<unknown> {
  try {
    return await page.loader({ request: req("/dev/inbox", { cookie }), params: {}, context: {} } as never);
  } catch (e) {
    if (e instanceof Response) return e;
    throw e;
  }
}

beforeAll(async () => {
  ctx = await setup();
  page = await import("~/routes/dev.inbox");
  await makeUser("hale.admin@brightspan.example", "admin", "Rowan Hale");
  await makeUser("ines.okafor@brightspan.example", "engineer", "Ines Okafor");
  adminCookie = await sessionCookie("hale.admin@brightspan.example");
  engineerCookie = await sessionCookie("ines.okafor@brightspan.example");
}, 120_000);
afterAll(async () => ctx?.services.stop());

describe("development inbox", () => {
  it("shows an admin the caught mail, newest first", async () => {
    ctx.services.mail.clear();
    const { sendMail } = await import("~/lib/mail.server");
    await sendMail({ to: "priya.v@brightspan.example", subject: "Review waiting: Canopy truss", text: "Open http://localhost:4310/jobs/j1" });
    await sendMail({ to: "ines.okafor@brightspan.example", subject: "Approved: Canopy truss", text: "Open http://localhost:4310/jobs/j1" });
    const data = (await load(adminCookie)) as { messages: { subject: string; to: string[] }[]; problem: string | null };
    expect(data.problem).toBeNull();
    expect(data.messages.map((m) => m.subject)).toEqual(["Approved: Canopy truss", "Review waiting: Canopy truss"]);
    expect(data.messages[1]!.to).toEqual(["priya.v@brightspan.example"]);
  });

  it("refuses other roles outside development, and sends anonymous callers to sign in", async () => {
    const res = (await load(engineerCookie)) as Response;
    expect(res.status).toBe(403);
    expect(((await res.json()) as { error: string }).error).toContain("your role is engineer");
    const anon = (await load()) as Response;
    expect(anon.status).toBe(302);
    expect(anon.headers.get("location")).toBe("/sign-in?redirectTo=%2Fdev%2Finbox");
  });
});
