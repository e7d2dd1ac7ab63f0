/** Sign-in back-off and the client address (issue: a forged X-Forwarded-For bypassed the limit and locked out shared addresses). */
import "../api/_env";
import { describe, expect, it } from "vitest";
import { makeUser } from "../api/_helpers";
import {
  backoffDelayS,
  clientIp,
  PEER_ADDRESS_HEADER,
  RATE_LIMITED_MESSAGE,
  SIGN_IN_BACKOFF,
  verifyCredentials,
} from "@/lib/server/auth";

const octet = () => 1 + Math.floor(Math.random() * 254);

describe("client address", () => {
  it("ignores a client's X-Forwarded-For when the peer is not a trusted proxy", () => {
    const h = new Headers({ [PEER_ADDRESS_HEADER]: "198.51.100.7", "x-forwarded-for": "203.0.113.9" });
    expect(clientIp(h, [])).toBe("198.51.100.7");
    expect(clientIp(h, ["192.0.2.1"])).toBe("198.51.100.7");
  });

  it("reads X-Forwarded-For from the right, skipping trusted proxies, when the peer is one", () => {
    const h = new Headers({
      [PEER_ADDRESS_HEADER]: "::ffff:10.0.0.2",
      "x-forwarded-for": "203.0.113.66, 198.51.100.20, 10.0.0.3",
    });
    // the left-most entry is whatever the client wrote; the first untrusted one from the right is the real client
    expect(clientIp(h, ["10.0.0.2", "10.0.0.3"])).toBe("198.51.100.20");
  });

  it("is unknown (null) without the peer address the server stamps", () => {
    expect(clientIp(new Headers({ "x-forwarded-for": "203.0.113.9" }), [])).toBeNull();
  });
});

describe("back-off", () => {
  it("doubles the delay with each failure beyond the free ones, up to the cap", () => {
    const { freePerEmail: free, maxDelayPerEmailS: cap } = SIGN_IN_BACKOFF;
    expect([0, 1, 2, 3, 4, 5, 6].map((n) => backoffDelayS(free + n, free, cap))).toEqual([0, 2, 4, 8, 16, 32, 64]);
    expect(backoffDelayS(free + 40, free, cap)).toBe(cap);
  });

  it("many failures from one shared address only delay another account's correct password, never refuse it for good", async () => {
    const ip = `192.0.2.${octet()}`;
    const victim = await makeUser("student");
    for (let i = 0; i < SIGN_IN_BACKOFF.freePerIp + 1; i++) {
      await expect(
        verifyCredentials({ email: `nobody-${i}-${victim.id}@example.com`, password: "guess" }, ip),
      ).rejects.toThrow();
    }
    await expect(verifyCredentials({ email: victim.email, password: victim.password }, ip)).rejects.toThrow(
      RATE_LIMITED_MESSAGE,
    );
    await new Promise((r) => setTimeout(r, 2_100));
    await expect(verifyCredentials({ email: victim.email, password: victim.password }, ip)).resolves.toMatchObject({
      id: victim.id,
    });
  });
});
