import { afterEach, beforeEach, vi } from "vitest";

let errors: unknown[][] = [];

// An unexpected console.error is a bug even when every assertion passes.
beforeEach(() => {
  errors = [];
  vi.spyOn(console, "error").mockImplementation((...args: unknown[]) => {
    errors.push(args);
  });
});

afterEach(() => {
  vi.mocked(console.error).mockRestore();
  if (errors.length) {
    throw new Error(`console.error was called:\n${errors.map((a) => a.map(String).join(" ")).join("\n")}`);
  }
});
