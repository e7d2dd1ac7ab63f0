import { describe, expect, it } from "vitest";
import { z } from "zod";
import { diffDocuments } from "@/lib/shared/plan-diff";
import { formatPath } from "@/kinematics";
import { AppError, errorBody } from "@/lib/server/errors";
import { toIssues } from "@/lib/server/route";
import { bearerToken, generateToken, hashToken } from "@/lib/server/tokens";

describe("error shape", () => {
  it("maps each error kind to its status and keeps one body shape", () => {
    const cases: [ConstructorParameters<typeof AppError>[0], number][] = [
      ["bad_request:validation", 400],
      ["unauthorized", 401],
      ["forbidden:plan", 403],
      ["not_found:project", 404],
      ["conflict:version", 409],
      ["payload_too_large", 413],
      ["unsupported_media_type", 415],
      ["unprocessable:arm-mismatch", 422],
    ];
    for (const [code, status] of cases) {
      const err = new AppError(code, "m", { issues: [{ path: "a", message: "b" }] });
      expect(err.status).toBe(status);
      expect(errorBody(err)).toEqual({ error: { code, message: "m", issues: [{ path: "a", message: "b" }] } });
    }
  });

  it("writes field paths the way the command line does", () => {
    expect(formatPath(["document", "arm", "joints", 1, "maxVelocity"])).toBe("document.arm.joints[1].maxVelocity");
    expect(formatPath([], "(body)")).toBe("(body)");
    const result = z
      .object({ moves: z.array(z.object({ duration: z.number() })) })
      .safeParse({ moves: [{ duration: 1 }, { duration: "x" }] });
    expect(result.success).toBe(false);
    if (!result.success)
      expect(toIssues(result.error, ["document"]).map((i) => i.path)).toEqual(["document.moves[1].duration"]);
  });
});

describe("API tokens", () => {
  it("are random, prefixed, and hashed with SHA-256 (FIPS 180-4 test vector for 'abc')", () => {
    const a = generateToken();
    const b = generateToken();
    expect(a.token).not.toBe(b.token);
    expect(a.token.startsWith("jpt_")).toBe(true);
    expect(a.hash).toBe(hashToken(a.token));
    expect(a.token.startsWith(a.prefix)).toBe(true);
    // FIPS 180-4 / NIST example: SHA-256("abc").
    expect(hashToken("abc")).toBe("ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad");
  });

  it("are read from the Authorization header as RFC 6750 Bearer credentials", () => {
    expect(bearerToken("Bearer jpt_abc-DEF_12")).toBe("jpt_abc-DEF_12");
    expect(bearerToken("bearer jpt_x")).toBe("jpt_x");
    expect(bearerToken("Basic dXNlcjpwYXNz")).toBeNull();
    expect(bearerToken("Bearer two words")).toBeNull();
    expect(bearerToken(null)).toBeNull();
  });
});

describe("version diff", () => {
  it("lists changed, added and removed fields with their paths", () => {
    const changes = diffDocuments(
      { start: [0, 1], moves: [{ d: 1 }] },
      { start: [0, 2], moves: [{ d: 1 }, { d: 3 }], extra: true },
    );
    expect(changes).toEqual([
      { path: "start[1]", change: "changed", from: 1, to: 2 },
      { path: "moves[1]", change: "added", to: { d: 3 } },
      { path: "extra", change: "added", to: true },
    ]);
    expect(diffDocuments({ a: [1, 2] }, { a: [1, 2] })).toEqual([]);
  });
});
