import { describe, expect, test } from "vitest";
import fc from "fast-check";
import { cookieValue, hashPassword, safeNextPath, verifyPassword } from "./auth";

// the lowest cost the hash accepts keeps these property runs short; the stored string carries it
const FAST = { log2N: 14, r: 8, p: 1, keyLength: 32, saltLength: 16 };

describe("password hashing", () => {
  test("the default parameters are the OWASP scrypt minimum and are written into the hash", async () => {
    const hash = await hashPassword("a long enough password");
    expect(hash).toMatch(/^scrypt\$17\$8\$1\$[A-Za-z0-9+/=]+\$[A-Za-z0-9+/=]+$/);
    expect(await verifyPassword("a long enough password", hash)).toBe(true);
    expect(await verifyPassword("a long enough passwore", hash)).toBe(false);
  });

  test("a password verifies against its own hash and no other password does", async () => {
    await fc.assert(
      fc.asyncProperty(fc.string({ minLength: 1, maxLength: 40 }), fc.string({ minLength: 1, maxLength: 40 }), async (a, b) => {
        const hash = await hashPassword(a, FAST);
        expect(await verifyPassword(a, hash)).toBe(true);
        if (a.normalize("NFC") !== b.normalize("NFC")) expect(await verifyPassword(b, hash)).toBe(false);
      }),
      { numRuns: 25 },
    );
  });

  test("two hashes of one password differ (random salt)", async () => {
    expect(await hashPassword("same password here", FAST)).not.toBe(await hashPassword("same password here", FAST));
  });

  test.each(["", "plain", "scrypt$17$8$1$abc$def", "scrypt$40$8$1$AAAAAAAAAAAAAAAAAAAAAA==$AAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAA="])("a malformed hash %j never verifies", async (stored) => {
    expect(await verifyPassword("anything", stored)).toBe(false);
  });

  test("an empty password is refused by the hasher", async () => {
    await expect(hashPassword("")).rejects.toThrow(TypeError);
  });
});

describe("cookieValue", () => {
  test.each([
    ["meltledger_session=abc; theme=dark", "abc"],
    ["theme=dark;meltledger_session=xyz", "xyz"],
    ["other_meltledger_session=no", null],
    ["", null],
    [null, null],
  ])("%j -> %j", (header, expected) => {
    expect(cookieValue(header, "meltledger_session")).toBe(expected);
  });
});

describe("safeNextPath", () => {
  test.each([
    ["/records?status=accepted", "/records?status=accepted"],
    ["//evil.example/x", "/"],
    ["/\\evil.example", "/"],
    ["https://evil.example", "/"],
    ["records", "/"],
    [undefined, "/"],
    ["/a\u0000b", "/"],
  ])("%j -> %j", (next, expected) => {
    expect(safeNextPath(next)).toBe(expected);
  });
});
