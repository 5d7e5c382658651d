import type { ShouldRevalidateFunctionArgs } from "react-router";

/**
 * What a client action answers when its request never reached the server (no signal): the page
 * puts its optimistic change back and says so. Nothing changed on the server, and there is no
 * signal to reload with, so no route revalidates after it (root.tsx and the route both check).
 */
export const OFFLINE_ANSWER = {
  ok: false as const,
  offline: true as const,
  message: "No connection: nothing was saved. Try again when you have signal.",
};

export function isOfflineAnswer(value: unknown): boolean {
  return !!value && typeof value === "object" && (value as { offline?: unknown }).offline === true;
}

/** A route's `shouldRevalidate`: the default, except after an offline answer. */
export function revalidateUnlessOffline({ actionResult, defaultShouldRevalidate }: ShouldRevalidateFunctionArgs) {
  return isOfflineAnswer(actionResult) ? false : defaultShouldRevalidate;
}
