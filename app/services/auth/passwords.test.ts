import { describe, expect, it } from "vitest";
import { COMMON_PASSWORDS, isCommonPassword } from "./common-passwords";
import { newPasswordField, PASSWORD_MAX, PASSWORD_MIN, passwordMatchesIdentity } from "./fields.server";

describe("the list of common passwords", () => {
  it("holds a few thousand entries, each long enough to pass the length rule on its own", () => {
    // The issue asks for "the commonest few thousand"; the generator is deterministic, so the size is fixed.
    expect(COMMON_PASSWORDS.size).toBeGreaterThanOrEqual(2000);
    for (const entry of COMMON_PASSWORDS) expect(entry.length).toBeGreaterThanOrEqual(PASSWORD_MIN);
  });

  it("catches the patterns that head leaked-password lists, whatever the letter case or symbol swaps", () => {
    for (const weak of [
      "password",
      "Password1",
      "P@ssw0rd",
      "12345678",
      "1234567890",
      "qwertyuiop",
      "1q2w3e4r",
      "iloveyou2019",
      "aaaaaaaa",
      "letmein!",
      "01011990",
      "Torqueleaf123",
    ]) {
      expect(isCommonPassword(weak), weak).toBe(true);
    }
  });

  it("lets ordinary long passphrases through", () => {
    for (const fine of ["brass fittings at dawn", "kestrel-under-the-hood-7", "Wire sized by volt drop", "m4ple syrup & relay"]) {
      expect(isCommonPassword(fine), fine).toBe(false);
    }
  });
});

describe("choosing a password (NIST SP 800-63B rev. 3 §5.1.1.2)", () => {
  it("requires at least 8 characters", () => {
    expect(newPasswordField.safeParse("short7!").success).toBe(false);
    expect(newPasswordField.safeParse("gear oil").success).toBe(true);
  });

  it("accepts at least 64 characters and imposes no composition rules", () => {
    expect(
      newPasswordField.safeParse("a".repeat(7) + " lowercase words only, no digits and no symbols at all, fine".padEnd(64, "."))
        .success,
    ).toBe(true);
    expect(newPasswordField.safeParse("x".repeat(PASSWORD_MAX + 1)).success).toBe(false);
    expect(PASSWORD_MAX).toBeGreaterThanOrEqual(64);
  });

  it("refuses a common password with a message that says why", () => {
    const result = newPasswordField.safeParse("password123");
    expect(result.success).toBe(false);
    expect(result.error?.issues[0].message).toMatch(/most common/);
  });

  it("refuses the account's own address or name as its password (context-specific words)", () => {
    expect(passwordMatchesIdentity("mina.solberg@example.test", { email: "mina.solberg@example.test" })).toBe(true);
    expect(passwordMatchesIdentity("Mina Solberg", { email: "m@example.test", name: "Mina Solberg" })).toBe(true);
    expect(passwordMatchesIdentity("a sentence of my own", { email: "m@example.test", name: "Mina Solberg" })).toBe(false);
  });
});
