import { type RouteConfig, index, route } from "@react-router/dev/routes";

export default [
  index("routes/library.tsx"),
  route("guides/:slug", "routes/guide.tsx"),
  route("tools/circuit", "routes/tools.circuit.tsx"),
  route("media/*", "routes/media.ts"),
  route("dev/inbox", "routes/dev.inbox.tsx"),
  route("api/catalogue", "routes/api.catalogue.ts"),
  route("api/guides", "routes/api.guides.ts"),
  route("api/guides/:slug", "routes/api.guide.ts"),
  // Work-through mode: the signed-in reader's own "step done" ticks.
  route("api/guides/:slug/step-ticks", "routes/api.step-ticks.ts"),
  // Authoring: a guide by its id, for its author and the editors.
  route("api/guides/import", "routes/api.guides-import.ts"),
  route("api/guides/:id/draft", "routes/api.guide-draft.ts"),
  route("api/guides/:id/submit", "routes/api.guide-submit.ts"),
  route("api/guides/:id/revision", "routes/api.guide-revision.ts"),
  route("api/guides/:id/export", "routes/api.guide-export.ts"),
  route("api/circuit", "routes/api.circuit.ts"),
  route("api/media", "routes/api.media.ts"),
  // Accounts, sign-in and administration of users.
  route("signup", "routes/signup.tsx"),
  route("login", "routes/login.tsx"),
  route("logout", "routes/logout.tsx"),
  route("verify/:token", "routes/verify.tsx"),
  route("reset", "routes/reset.tsx"),
  route("reset/:token", "routes/reset.token.tsx"),
  route("auth/github", "routes/auth.github.ts"),
  route("auth/github/callback", "routes/auth.github.callback.ts"),
  route("auth/github/link", "routes/auth.github.link.tsx"),
  route("me/account", "routes/me.account.tsx"),
  route("me/checklists/:id/csv", "routes/me.checklist-csv.ts"),
  route("mail/opt-out/:token", "routes/mail.opt-out.tsx"),
  route("contributor-terms", "routes/contributor-terms.tsx"),
  route("admin/users", "routes/admin.users.tsx"),
  route("admin/audit", "routes/admin.audit.tsx"),
  route("admin/catalogue", "routes/admin.catalogue.tsx"),
  // Authoring.
  route("workbench", "routes/workbench.tsx"),
  route("workbench/guides/new", "routes/workbench.guides.new.tsx"),
  route("workbench/guides/:id", "routes/workbench.guide.tsx"),
  route("workbench/guides/:id/preview", "routes/workbench.guide-preview.tsx"),
  route("api/me", "routes/api.me.ts"),
  // The review desk: editors review, sign off, decide and unpublish.
  route("review", "routes/review.tsx"),
  route("review/:revisionId", "routes/review.revision.tsx"),
  route("api/review/queue", "routes/api.review-queue.ts"),
  route("api/review/:revisionId", "routes/api.review.ts"),
  // A reader's parts checklists (`:id.csv` on the checklist's address answers its CSV).
  route("api/checklists", "routes/api.checklists.ts"),
  route("api/checklists/:id", "routes/api.checklist.ts"),
  route("api/checklists/:id/items", "routes/api.checklist-items.ts"),
  route("api/checklists/:id/items/:itemId", "routes/api.checklist-item.ts"),
  // Any other /api address answers in the API's JSON error shape, not with the HTML 404 page.
  route("api/*", "routes/api.not-found.ts"),
  route("*", "routes/not-found.tsx"),
] satisfies RouteConfig;
