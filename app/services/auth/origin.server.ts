const SAFE_METHODS = new Set(["GET", "HEAD"]);

/**
 * A write is accepted only from our own pages: its Origin is APP_ORIGIN, or the browser vouches
 * for it with `Sec-Fetch-Site: same-origin`. Requests with neither are refused too, because
 * SameSite=Lax alone does not cover same-site subdomains or old browsers.
 */
export function isAllowedWrite(request: Request, appOrigin: string): boolean {
  if (SAFE_METHODS.has(request.method.toUpperCase())) return true;
  const origin = request.headers.get("origin");
  if (origin && origin !== "null") {
    try {
      if (new URL(origin).origin === new URL(appOrigin).origin) return true;
    } catch {
      // not a URL: fall through to the fetch-metadata check
    }
  }
  return request.headers.get("sec-fetch-site") === "same-origin";
}

export const CROSS_SITE_MESSAGE =
  "This request did not come from a Torqueleaf page, so it was refused. Reload the page and send the form again.";
