import { scryptSync } from "node:crypto";
import { describe, expect, it } from "vitest";
import { hashPassword, verifyPassword } from "./password.server";

describe("password hashing", () => {
  it("verifies the password it hashed", async () => {
    const stored = await hashPassword("prairie smoke in May");
    expect(await verifyPassword("prairie smoke in May", stored)).toBe(true);
  });

  it("refuses a wrong password, even one letter off", async () => {
    const stored = await hashPassword("prairie smoke in May");
    expect(await verifyPassword("prairie smoke in may", stored)).toBe(false);
  });

  it("salts every hash, so one password never hashes the same twice", async () => {
    expect(await hashPassword("same words")).not.toBe(await hashPassword("same words"));
  });

  it("stores scrypt parameters, salt and key that Node's scrypt reproduces (RFC 7914)", async () => {
    const stored = await hashPassword("wild bergamot");
    const [scheme, N, r, p, salt, key] = stored.split("$");
    expect(scheme).toBe("scrypt");
    const recomputed = scryptSync("wild bergamot", Buffer.from(salt!, "base64url"), 64, {
      N: Number(N),
      r: Number(r),
      p: Number(p),
      maxmem: 256 * 1024 * 1024,
    });
    expect(recomputed.toString("base64url")).toBe(key);
  });

  it("refuses a stored value of another scheme instead of throwing", async () => {
    expect(await verifyPassword("anything", "md5$abc")).toBe(false);
  });
});
