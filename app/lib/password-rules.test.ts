import { describe, expect, it } from "vitest";
import { MAX_PASSWORD_BYTES, passwordBytes, passwordProblem } from "./password-rules";
import { ChangePasswordSchema, CreateUserSchema } from "./user-forms";
import { DEMO_PASSWORD } from "../../seeds/01_agency_and_accounts";

describe("new password rules", () => {
  it("accept a long passphrase of unrelated words", () => {
    expect(passwordProblem("tidal basin proportioner 42")).toBeNull();
    // The demo accounts' password, as README states it, meets the rules it asks of everyone.
    expect(passwordProblem(DEMO_PASSWORD)).toBeNull();
  });

  it("refuse fewer than 12 characters, counting characters rather than bytes", () => {
    expect(passwordProblem("short pass1")).toMatch(/at least 12 characters/);
    expect(passwordProblem("ääääkl mnop")).toMatch(/at least 12/);
  });

  it("refuse one character repeated", () => {
    expect(passwordProblem("aaaaaaaaaaaaaaaa")).toMatch(/One character repeated/);
    expect(passwordProblem("🔥🔥🔥🔥🔥🔥🔥🔥🔥🔥🔥🔥")).toMatch(/One character repeated/);
  });

  it("refuse common passwords and easy patterns", () => {
    for (const common of ["password1234", "qwertyuiopas", "demo-password", "123456789012", "iloveyou1234"]) {
      expect(passwordProblem(common), common).toMatch(/common or follows an easy pattern/);
    }
  });

  it("refuse more than bcrypt's 72 bytes, counting UTF-8 bytes", () => {
    const ascii = "river pump ladder hose ".repeat(4).slice(0, MAX_PASSWORD_BYTES);
    expect(passwordBytes(ascii)).toBe(72);
    expect(passwordProblem(ascii)).toBeNull();
    expect(passwordProblem(`${ascii}x`)).toMatch(/at most 72 bytes/);
    // 36 two-byte letters are 72 bytes; one more is too many though only 37 characters.
    const accented = "é".repeat(30) + "ñ".repeat(7);
    expect(passwordBytes(accented)).toBe(74);
    expect(passwordProblem(accented)).toMatch(/at most 72 bytes/);
  });

  it("give the field its message in the forms' shared schemas", () => {
    const result = ChangePasswordSchema.safeParse({
      currentPassword: "x",
      newPassword: "password1234",
      confirmPassword: "password1234",
    });
    expect(result.success).toBe(false);
    expect(result.error?.issues.map((issue) => [issue.path.join("."), issue.message])).toEqual([
      ["newPassword", "This password is common or follows an easy pattern. Try three or four unrelated words."],
    ]);
    const created = CreateUserSchema.safeParse({
      intent: "create",
      name: "N",
      email: "n@test.example",
      password: "zzzzzzzzzzzzzz",
      roles: ["officer"],
    });
    expect(created.error?.issues[0]).toMatchObject({ path: ["password"], message: expect.stringMatching(/repeated/) });
  });
});
