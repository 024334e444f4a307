import { clientAddress } from "@/lib/auth/client-address";

describe("the address a sign-in attempt is counted under", () => {
  it("ignores a client-sent X-Forwarded-For when no trusted proxy is configured", () => {
    expect(clientAddress({ "x-forwarded-for": "198.18.0.9" }, false)).toBe("direct");
    expect(clientAddress({ "x-forwarded-for": "198.18.0.10" }, false)).toBe(clientAddress({}, false));
  });

  it("behind a trusted proxy takes the entry the proxy appended (the last), not the client's own", () => {
    expect(clientAddress({ "x-forwarded-for": "198.18.0.9, 203.0.113.7" }, true)).toBe("203.0.113.7");
    expect(clientAddress({ "x-forwarded-for": ["1.1.1.1", "203.0.113.8"] }, true)).toBe("203.0.113.8");
    expect(clientAddress({}, true)).toBe("unknown");
  });
});
