// Configuration is checked once at start-up, and a wrong variable is named in the message
// (issue 2: "a wrong variable stops the app with a message naming it").
import { describe, expect, it } from "vitest";
import { ConfigError, parseConfig, signUpMode } from "~/lib/config.server";

function messageFor(env: Record<string, string>): string {
  try {
    parseConfig(env);
  } catch (e) {
    expect(e).toBeInstanceOf(ConfigError);
    return (e as Error).message;
  }
  throw new Error(`expected ${JSON.stringify(env)} to be refused`);
}

describe("parseConfig", () => {
  it.each([
    ["PORT", "eighty"],
    ["PORT", "70000"],
    ["PORT", "80.5"],
    ["SMTP_PORT", "0"],
    ["S3_PORT", "-1"],
  ])("refuses %s=%s, naming the variable and the value", (name, value) => {
    const msg = messageFor({ [name]: value });
    expect(msg).toContain(`${name} (got "${value}")`);
    expect(msg).toContain("whole number from 1 to 65535");
  });

  it("refuses a DATABASE_URL the libSQL client cannot open, naming it", () => {
    const msg = messageFor({ DATABASE_URL: "postgres://db.example/strutwise" });
    expect(msg).toMatch(/^ {2}DATABASE_URL \(got "postgres:\/\/db\.example\/strutwise"\): must start with file:/m);
  });

  it("names every wrong variable at once, and never prints a secret's value", () => {
    const msg = messageFor({ PORT: "x", S3_ENDPOINT: "not a url", BETTER_AUTH_SECRET: "tooshort-secret" });
    expect(msg).toContain("PORT");
    expect(msg).toContain("S3_ENDPOINT");
    expect(msg).toContain("BETTER_AUTH_SECRET: must be at least 32 characters");
    expect(msg).not.toContain("tooshort-secret");
  });

  it("refuses the public development secret in production", () => {
    expect(messageFor({ NODE_ENV: "production" })).toContain("BETTER_AUTH_SECRET");
  });

  it("derives the local defaults from DATA_DIR and the local service ports", () => {
    const c = parseConfig({ DATA_DIR: "/srv/desk", S3_PORT: "4600", MAIL_HTTP_PORT: "4601" });
    expect(c.DATABASE_URL).toBe("file:/srv/desk/strutwise.db");
    expect(c.S3_ENDPOINT).toBe("http://127.0.0.1:4600");
    expect(c.MAIL_CATCHER_URL).toBe("http://127.0.0.1:4601");
    expect(c.PORT).toBe(4310);
    expect(c.APP_URL).toBe("http://localhost:4310");
    expect(c.SEED_DEMO).toBe("on");
  });

  it("keeps explicit hosted-service settings, and no mail catcher with LOCAL_SERVICES=off", () => {
    const c = parseConfig({
      LOCAL_SERVICES: "off",
      DATABASE_URL: "libsql://desk-db.example.net",
      S3_ENDPOINT: "https://s3.eu-central-1.amazonaws.com",
      S3_FORCE_PATH_STYLE: "false",
    });
    expect(c.DATABASE_URL).toBe("libsql://desk-db.example.net");
    expect(c.S3_ENDPOINT).toBe("https://s3.eu-central-1.amazonaws.com");
    expect(c.S3_FORCE_PATH_STYLE).toBe(false);
    expect(c.MAIL_CATCHER_URL).toBeUndefined();
    expect(c.SEED_DEMO).toBe("off"); // public demo passwords stay out of a deployment
  });

  it("treats empty variables as unset", () => {
    expect(parseConfig({ PORT: "", DATABASE_URL: "" }).PORT).toBe(4310);
  });
});

describe("SIGN_UP (issue 14)", () => {
  it("is invite-only unless set, and reads open and domain lists", () => {
    expect(signUpMode(parseConfig({}))).toEqual({ kind: "invite-only" });
    expect(signUpMode(parseConfig({ SIGN_UP: "open" }))).toEqual({ kind: "open" });
    expect(signUpMode(parseConfig({ SIGN_UP: "domain:TarrowKeel.example,keel-site.example" }))).toEqual({ kind: "domain", domains: ["tarrowkeel.example", "keel-site.example"] });
  });

  it.each(["anyone", "domain:", "domain:localhost", "domain:a.example,,b.example"])("refuses SIGN_UP=%s at start-up, naming the choices", (value) => {
    const msg = messageFor({ SIGN_UP: value });
    expect(msg).toContain(`SIGN_UP (got "${value}")`);
    expect(msg).toContain("invite-only, open, or domain:<list>");
  });

  it("keeps invitations 7 days unless INVITATION_TTL_DAYS says otherwise", () => {
    expect(parseConfig({}).INVITATION_TTL_DAYS).toBe(7);
    expect(parseConfig({ INVITATION_TTL_DAYS: "2" }).INVITATION_TTL_DAYS).toBe(2);
    expect(messageFor({ INVITATION_TTL_DAYS: "0" })).toContain("INVITATION_TTL_DAYS");
  });
});
