import { describe, expect, test } from "vitest";
import fc from "fast-check";
import { bindHostFromArgv, decideServerMode, isLoopbackHost } from "./mode";

describe("isLoopbackHost", () => {
  test.each([
    ["localhost", true],
    ["LOCALHOST:3000", true],
    ["127.0.0.1", true],
    ["127.0.0.1:3600", true],
    ["127.45.6.7", true],
    ["[::1]:3000", true],
    ["::1", true],
    ["::ffff:127.0.0.1", true],
    ["0.0.0.0", false],
    ["::", false],
    ["192.168.1.20", false],
    ["127.0.0.1.evil.example", false],
    ["localhost.evil.example", false],
    ["128.0.0.1", false],
    ["127.0.0.256", false],
    ["", false],
    [null, false],
  ])("%s -> %s", (host, expected) => {
    expect(isLoopbackHost(host)).toBe(expected);
  });

  test("no address outside 127.0.0.0/8 counts as loopback", () => {
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 255 }), fc.integer({ min: 0, max: 255 }), fc.integer({ min: 0, max: 255 }), fc.integer({ min: 0, max: 255 }), (a, b, c, d) => {
        expect(isLoopbackHost(`${a}.${b}.${c}.${d}`)).toBe(a === 127);
      }),
    );
  });
});

describe("bindHostFromArgv", () => {
  test.each([
    [["node", "next", "start", "-p", "3000", "-H", "127.0.0.1"], "127.0.0.1"],
    [["node", "next", "start", "--hostname", "0.0.0.0"], "0.0.0.0"],
    [["node", "next", "start", "--hostname=::1"], "::1"],
    [["node", "next", "start", "-p", "3000"], null],
  ])("%j -> %s", (argv, expected) => {
    expect(bindHostFromArgv(argv)).toBe(expected);
  });
});

describe("decideServerMode", () => {
  test.each([
    // [MELTLEDGER_MODE, bind host, process, expected mode]
    [undefined, "127.0.0.1", "production", "local"],
    [undefined, "localhost", "production", "local"],
    [undefined, "0.0.0.0", "production", "team"],
    [undefined, "192.168.1.5", "production", "team"],
    [undefined, null, "production", "team"],
    [undefined, null, "development", "local"],
    [undefined, null, "none", "local"],
    ["team", "127.0.0.1", "production", "team"],
    ["TEAM", null, "none", "team"],
    ["local", "127.0.0.1", "production", "local"],
    ["local", null, "production", "local"],
    ["local", "0.0.0.0", "production", "team"],
    ["open", "127.0.0.1", "production", "team"],
  ] as const)("MELTLEDGER_MODE=%s, bind %s, %s -> %s", (modeEnv, bindHost, server, expected) => {
    const d = decideServerMode({ modeEnv, bindHost, server });
    expect(d.mode).toBe(expected);
    expect(d.reason.length).toBeGreaterThan(10);
  });
});
