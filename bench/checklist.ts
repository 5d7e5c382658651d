/**
 * A reader's checklist tick over HTTP, round trip: the demo reader signs in, saves a parts
 * checklist from a guide (`POST /api/checklists`), then ticks and unticks its items one after the
 * other (`PATCH /api/checklists/:id/items/:itemId`), each request waiting for the one before, as a
 * phone in the garage does. Prints p50 and p99 of the round trip.
 */
import { type Summary, summarize } from "./stats";

type Checklist = { id: number; items: { id: number; checked: boolean }[] };

/** The demo reader's session cookie, from the sign-in form (as a browser posts it). */
async function signIn(origin: string): Promise<string> {
  const response = await fetch(new URL("/login", origin), {
    method: "POST",
    redirect: "manual",
    headers: { "Sec-Fetch-Site": "same-origin", "Content-Type": "application/x-www-form-urlencoded" },
    body: new URLSearchParams({ email: "reader@torqueleaf.test", password: "torqueleaf-demo" }),
  });
  await response.arrayBuffer();
  const cookies = response.headers.getSetCookie().map((line) => line.split(";")[0]);
  if (response.status !== 302 || cookies.length === 0) throw new Error(`signing in answered ${response.status}`);
  return cookies.join("; ");
}

export async function checklistTicks(origin: string, guideSlug: string, runs: number): Promise<Summary> {
  const cookie = await signIn(origin);
  const headers = { "Sec-Fetch-Site": "same-origin", Cookie: cookie, "Content-Type": "application/json" };
  const created = await fetch(new URL("/api/checklists", origin), {
    method: "POST",
    headers,
    body: JSON.stringify({ guideSlug }),
  });
  if (created.status !== 201) throw new Error(`saving a checklist answered ${created.status}: ${await created.text()}`);
  const checklist = (await created.json()) as Checklist;
  if (checklist.items.length === 0) throw new Error(`the checklist of ${guideSlug} has no items`);
  const samples: number[] = [];
  for (let i = 0; i < runs; i++) {
    const item = checklist.items[i % checklist.items.length];
    item.checked = !item.checked;
    const before = performance.now();
    const response = await fetch(new URL(`/api/checklists/${checklist.id}/items/${item.id}`, origin), {
      method: "PATCH",
      headers,
      body: JSON.stringify({ checked: item.checked }),
    });
    await response.arrayBuffer();
    if (response.status !== 200) throw new Error(`a tick answered ${response.status}`);
    samples.push(performance.now() - before);
  }
  await fetch(new URL(`/api/checklists/${checklist.id}`, origin), { method: "DELETE", headers });
  return summarize(samples);
}
