// What reaches the error log: no query strings (invitation links carry their secret there) and no
// SQL parameters (mail bodies and hashes travel in them).
import { describe, expect, it } from "vitest";
import { describeError, withoutQueryStrings } from "@/server/http/logError";

describe("error log redaction", () => {
  it("cuts query strings from absolute and relative URLs", () => {
    expect(withoutQueryStrings("GET https://tw.example/sign-in?next=/x&token=abc failed")).toBe(
      "GET https://tw.example/sign-in?… failed",
    );
    expect(withoutQueryStrings("at /api/v1/runs?limit=5&cursor=9 ok")).toBe("at /api/v1/runs?… ok");
  });

  it("leaves out a failed query's parameters, also in the cause", () => {
    const cause = Object.assign(new Error("Data too long for column 'body_text'"), { code: "ER_DATA_TOO_LONG" });
    const e = new Error(
      "Failed query: insert into `mail_outbox` (`body_text`) values (?)\nparams: Choose your password here: https://tw.example/invite/SECRET123",
      { cause },
    );
    const line = describeError(e);
    expect(line).toContain("Failed query: insert into `mail_outbox`");
    expect(line).toContain("ER_DATA_TOO_LONG");
    expect(line).not.toContain("SECRET123");
    expect(line).not.toContain("Choose your password");
  });
});
