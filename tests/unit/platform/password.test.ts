import { describe, expect, it } from "vitest";
import { passwordProblem } from "../../../app/lib/password.server";

// OWASP ASVS 5.0 §6.2: at least 8 characters, 15 recommended, no composition rules, block common passwords.
describe("password rules (ASVS 5.0 §6.2)", () => {
  it("refuses fewer than 8 characters, counting characters rather than bytes", () => {
    expect(passwordProblem("seven77")).toMatch(/at least 8/);
    expect(passwordProblem("ünïcödé")).toMatch(/at least 8/);
  });
  it("asks for no mix of character classes: eight lower-case letters that are not common pass", () => {
    expect(passwordProblem("quillrod")).toBeNull();
    expect(passwordProblem("griddle element relay")).toBeNull();
  });
  it("refuses commonly used passwords (Mozilla's common-password list), whatever their case", () => {
    expect(passwordProblem("password123")).toMatch(/commonly used/);
    expect(passwordProblem("Football")).toMatch(/commonly used/);
    expect(passwordProblem("qwerty123")).toMatch(/commonly used/);
  });
  it("refuses the account's own e-mail address", () => {
    expect(passwordProblem("sam@shop.example", "Sam@shop.example")).toMatch(/e-mail/);
  });
});
