import { describe, expect, it } from "vitest";
import { hashPassword, isCommonPassword, passwordMatches } from "./passwords.ts";

describe("common passwords (list from @zxcvbn-ts/language-common)", () => {
  it("catches well-known leaked passwords, also with a trailing number or symbol", () => {
    for (const p of ["password123", "qwertyuiop", "1234567890", "iloveyou2026", "Sunshine!!"]) expect(isCommonPassword(p), p).toBe(true);
  });
  it("lets long, unusual passphrases through", () => {
    for (const p of ["honey-locust-slabs", "kiln-dried-walnut-88", "sawdust in the gloves"]) expect(isCommonPassword(p), p).toBe(false);
  });
});

describe("bcrypt hashing", () => {
  it("hashes with the given cost and verifies only the right password", async () => {
    const hash = await hashPassword("kiln-dried-walnut-88", 5);
    expect(hash).toMatch(/^\$2[aby]\$05\$/);
    expect(await passwordMatches("kiln-dried-walnut-88", hash)).toBe(true);
    expect(await passwordMatches("kiln-dried-walnut-89", hash)).toBe(false);
  });
});
