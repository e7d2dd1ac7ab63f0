import { afterEach, describe, expect, it } from "vitest";
import {
  connectionNow,
  meansUnreachable,
  reportReachable,
  reportUnavailable,
  subscribeConnection,
} from "@/lib/client/connection";

afterEach(() => reportReachable());

describe("the client's view of the server's database", () => {
  it("only the database's 503 (or a bare 503 from in front of the server) means reconnecting; a busy check does not", () => {
    expect(meansUnreachable(503, "unavailable:database")).toBe(true);
    expect(meansUnreachable(503, undefined)).toBe(true);
    expect(meansUnreachable(503, "unavailable:check-busy")).toBe(false);
    expect(meansUnreachable(500, undefined)).toBe(false);
  });

  it("a 503 turns it to reconnecting with the Retry-After wait, and the next normal answer turns it back, telling subscribers each time", () => {
    const seen: string[] = [];
    const stop = subscribeConnection(() => seen.push(connectionNow().state));
    reportUnavailable(3);
    expect(connectionNow()).toMatchObject({ state: "reconnecting", retryAfterS: 3 });
    reportUnavailable(Number.NaN); // no Retry-After header: ask again after 2 s
    expect(connectionNow()).toMatchObject({ state: "reconnecting", retryAfterS: 2 });
    reportReachable();
    expect(connectionNow().state).toBe("ok");
    stop();
    reportUnavailable(1);
    expect(seen).toEqual(["reconnecting", "reconnecting", "ok"]);
  });
});
