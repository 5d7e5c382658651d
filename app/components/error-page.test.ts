import { describe, expect, it } from "vitest";
import { repeatsBody } from "./error-page";

describe("repeatsBody", () => {
  it("takes a route's refusal that restates the page's sentence as a repeat", () => {
    // The default refusal (app/utils/errors.ts) beside the 403 page's own sentence.
    expect(repeatsBody("Your account does not have access to this.", "Your account does not have access to this page.")).toBe(
      true,
    );
  });

  it("keeps a message that says something more", () => {
    expect(repeatsBody("Only editors can review revisions.", "Your account does not have access to this page.")).toBe(false);
    expect(repeatsBody("", "Your account does not have access to this page.")).toBe(false);
  });
});
