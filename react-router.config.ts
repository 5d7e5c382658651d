import type { Config } from "@react-router/dev/config";

export default {
  ssr: true,
  future: {
    // The root middleware (app/root.tsx) loads the session and refuses cross-site writes for every
    // route, resource routes and /api included, in `npm run dev` and `npm start` alike.
    v8_middleware: true,
  },
  // React Router's own action check compares Origin with the request's host and answers 400 before
  // any middleware runs; behind a proxy that host is not the public one. Our middleware applies the
  // stricter rule (Origin must equal APP_ORIGIN, or Sec-Fetch-Site same-origin) and answers 403, so
  // the built-in check is opened up here and the decision is ours alone.
  allowedActionOrigins: ["**"],
} satisfies Config;
