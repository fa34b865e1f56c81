import { describe, expect, it } from "vitest";
import { fieldMessages } from "./common.ts";
import { signInSchema, signUpSchema, yardProfileUpdateSchema } from "./accounts.ts";

describe("signUpSchema", () => {
  it("accepts a buyer and normalises the e-mail", () => {
    const parsed = signUpSchema.parse({
      role: "buyer",
      email: "  Ana.Brandt@Lakemont.TEST ",
      password: "first-dining-table",
      displayName: " Ana ",
    });
    expect(parsed).toEqual({ role: "buyer", email: "ana.brandt@lakemont.test", password: "first-dining-table", displayName: "Ana" });
  });

  it("asks a sawyer for yard name and pickup town", () => {
    const result = signUpSchema.safeParse({
      role: "sawyer",
      email: "yard@lakemont.test",
      password: "long-enough-pass",
      displayName: "Sam",
    });
    expect(result.success).toBe(false);
    if (!result.success) expect(Object.keys(fieldMessages(result.error)).sort()).toEqual(["pickupTown", "yardName"]);
  });

  it("refuses the admin role and unknown roles", () => {
    for (const role of ["admin", "wizard", undefined]) {
      const result = signUpSchema.safeParse({ role, email: "x@lakemont.test", password: "long-enough-pass", displayName: "X" });
      expect(result.success, String(role)).toBe(false);
    }
  });

  it("needs a password of 10 to 200 characters and a valid address, each with its own message", () => {
    const result = signUpSchema.safeParse({ role: "buyer", email: "not-an-address", password: "short", displayName: "X" });
    expect(result.success).toBe(false);
    if (!result.success) {
      const fields = fieldMessages(result.error);
      expect(fields.email).toMatch(/valid e-mail/);
      expect(fields.password).toMatch(/at least 10/);
    }
    expect(signUpSchema.safeParse({ role: "buyer", email: "a@b.test", password: "x".repeat(201), displayName: "X" }).success).toBe(false);
  });
});

describe("other account schemas", () => {
  it("sign-in needs both fields", () => {
    expect(signInSchema.safeParse({ email: "a@b.test" }).success).toBe(false);
    expect(signInSchema.safeParse({ email: "a@b.test", password: "p" }).success).toBe(true);
  });

  it("a yard update must change something", () => {
    expect(yardProfileUpdateSchema.safeParse({}).success).toBe(false);
    expect(yardProfileUpdateSchema.parse({ pickupTown: " Northshore " })).toEqual({ pickupTown: "Northshore" });
  });
});

describe("update schemas leave out what was not sent", async () => {
  const { logUpdateSchema, slabUpdateSchema } = await import("./yard.ts");
  const { listingUpdateSchema } = await import("./listings.ts");
  it("a partial update parses to just the fields given", () => {
    expect(logUpdateSchema.parse({ siteNeighbourhood: "Old Mill" })).toEqual({ siteNeighbourhood: "Old Mill" });
    expect(slabUpdateSchema.parse({ thicknessMm: 52 })).toEqual({ thicknessMm: 52 });
    expect(listingUpdateSchema.parse({ title: "Walnut pair" })).toEqual({ title: "Walnut pair" });
  });
});

describe("names other people see", () => {
  const buyer = (displayName: string) =>
    signUpSchema.safeParse({ role: "buyer", email: "n@lakemont.test", password: "long-enough-pass", displayName });

  it("refuse line breaks, control characters and direction overrides", () => {
    for (const name of [
      "Ana\r\nBcc: all@lakemont.test",
      "Ana\nBrandt",
      "Ana\u0000",
      "Ana\tB",
      "Ana\u0007",
      "Ana\u2028B",
      "\u202EtnardB anA",
      "Ana\u2066B\u2069",
    ]) {
      const result = buyer(name);
      expect(result.success, JSON.stringify(name)).toBe(false);
      if (!result.success) expect(fieldMessages(result.error).displayName).toMatch(/no line breaks or control characters/);
    }
  });

  it("take names in any script, with accents, apostrophes and emoji", () => {
    for (const name of ["Zoë O'Neill", "Łucja Wąs", "Юлия", "山田 花子", "Ana 🌳", "Renée-Marie"])
      expect(buyer(name).success, name).toBe(true);
  });

  it("apply to the yard name and the pickup town too; a town needs a letter", () => {
    expect(yardProfileUpdateSchema.safeParse({ yardName: "Mill\r\nTwo" }).success).toBe(false);
    expect(yardProfileUpdateSchema.safeParse({ pickupTown: "Lake\u0000mont" }).success).toBe(false);
    expect(yardProfileUpdateSchema.safeParse({ pickupTown: "🌲🌲" }).success).toBe(false);
    expect(yardProfileUpdateSchema.safeParse({ pickupTown: "Lakemont", yardName: "Ridgeback Urban Timber" }).success).toBe(true);
  });
});
