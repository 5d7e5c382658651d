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

/**
 * The one address that takes writes from elsewhere: a mail's one-click opt-out (RFC 8058). Mail
 * clients post it from their own servers or web pages, never with our Origin, and without cookies.
 * That is safe here because the request is authorised by the HMAC-signed token in the path, not by
 * a session: a forged cross-site post needs the token, which only the mail's recipient has, and can
 * do no more than turn off one kind of notice for that recipient (undone in account settings).
 */
export const isOneClickOptOut = (request: Request) =>
  request.method.toUpperCase() === "POST" && /^\/mail\/opt-out\/[^/]+$/.test(new URL(request.url).pathname);

export const CROSS_SITE_MESSAGE =
  "This request did not come from a Torqueleaf page, so it was refused. Reload the page and send the form again.";
