import { describe, expect, it } from "vitest";
import { plainText } from "../support/http-client";
import { routeList } from "../support/route-walk";
import { sharedApp } from "../support/shared-app";

// The reader API's OpenAPI document and its human page, over HTTP on the shared app server.
const app = sharedApp("openapi");

type Operation = {
  operationId?: string;
  parameters?: { name: string; in: string; required?: boolean; schema?: unknown }[];
  requestBody?: { content: Record<string, { schema: unknown }> };
  responses: Record<string, { description: string; content?: Record<string, { schema: unknown }> }>;
};
type Document = {
  openapi: string;
  info: { title: string; version: string };
  paths: Record<string, Record<string, Operation>>;
  components?: { schemas?: Record<string, unknown>; securitySchemes?: Record<string, unknown> };
};

const METHODS = ["get", "put", "post", "delete", "options", "head", "patch", "trace"];

/** Every `$ref` in the document, to check each one names a component that exists. */
function refs(value: unknown, found: string[] = []): string[] {
  if (Array.isArray(value)) for (const v of value) refs(v, found);
  else if (value && typeof value === "object") {
    for (const [k, v] of Object.entries(value)) {
      if (k === "$ref" && typeof v === "string") found.push(v);
      else refs(v, found);
    }
  }
  return found;
}

describe("the OpenAPI document", () => {
  it("is an OpenAPI 3.1 document of the shape the specification asks for", async () => {
    const response = await app.client().get("/api/openapi.json");
    expect(response.status).toBe(200);
    expect(response.headers.get("content-type")).toMatch(/^application\/json/);
    const doc = (await response.json()) as Document;
    // OpenAPI Specification 3.1.0, §4.8.1 (OpenAPI Object): openapi, info (title, version) and paths.
    expect(doc.openapi).toMatch(/^3\.1\.\d+$/);
    expect(typeof doc.info.title).toBe("string");
    expect(typeof doc.info.version).toBe("string");
    const ids: string[] = [];
    for (const [path, item] of Object.entries(doc.paths)) {
      // §4.8.8.1: a path begins with a slash; it carries no query string.
      expect(path.startsWith("/"), path).toBe(true);
      expect(path, path).not.toContain("?");
      const templated = [...path.matchAll(/\{(\w+)\}/g)].map((m) => m[1]);
      for (const [method, op] of Object.entries(item)) {
        expect(METHODS, `${path} ${method}`).toContain(method);
        // §4.8.10.1: an operationId is unique among all operations.
        if (op.operationId) ids.push(op.operationId);
        // §4.8.12.1: each templated name has a path parameter, and a path parameter is required.
        const inPath = (op.parameters ?? []).filter((p) => p.in === "path");
        expect(inPath.map((p) => p.name).sort(), `${path} ${method}`).toEqual([...templated].sort());
        for (const p of inPath) expect(p.required, `${path} ${method} ${p.name}`).toBe(true);
        // §4.8.16: at least one response, each with a description.
        const responses = Object.entries(op.responses);
        expect(responses.length, `${path} ${method}`).toBeGreaterThan(0);
        for (const [status, answer] of responses) {
          expect(status, `${path} ${method}`).toMatch(/^([1-5]\d\d|[1-5]XX|default)$/);
          expect(typeof answer.description).toBe("string");
        }
      }
    }
    expect(new Set(ids).size).toBe(ids.length);
    for (const ref of refs(doc)) {
      const name = ref.replace(/^#\/components\/schemas\//, "");
      expect(ref, ref).toMatch(/^#\/components\/schemas\//);
      expect(doc.components?.schemas, ref).toHaveProperty(name);
    }
  });

  it("lists every reader route (checklists, vehicles, fitment reports, step ticks) and the public ones, with the schemas the routes parse", async () => {
    const doc = (await (await app.client().get("/api/openapi.json")).json()) as Document;
    const listed = new Set(Object.entries(doc.paths).flatMap(([path, item]) => Object.keys(item).map((m) => `${m} ${path}`)));
    const openApiPath = (pattern: string) => pattern.replace(/:(\w+)/g, "{$1}");
    const checklistRoutes = routeList()
      .map((r) => r.pattern)
      .filter(
        (p) =>
          p.startsWith("/api/checklists") ||
          p.startsWith("/api/me/vehicles") ||
          /^\/api\/.*\/(fitment-reports|step-ticks)$/.test(p),
      );
    expect(checklistRoutes.length).toBeGreaterThanOrEqual(5);
    for (const pattern of checklistRoutes) {
      expect(
        [...listed].some((entry) => entry.endsWith(` ${openApiPath(pattern)}`)),
        pattern,
      ).toBe(true);
    }
    for (const entry of [
      "get /api/catalogue",
      "get /api/guides",
      "get /api/guides/{slug}",
      "get /api/checklists",
      "post /api/checklists",
      "get /api/checklists/{id}",
      "delete /api/checklists/{id}",
      "get /api/checklists/{id}.csv",
      "post /api/checklists/{id}/merge",
      "post /api/checklists/{id}/items",
      "patch /api/checklists/{id}/items/{itemId}",
      "delete /api/checklists/{id}/items/{itemId}",
      "get /api/me/vehicles",
      "post /api/me/vehicles",
      "delete /api/me/vehicles/{id}",
      "post /api/guides/{slug}/fitment-reports",
      "get /api/guides/{slug}/step-ticks",
      "put /api/guides/{slug}/step-ticks",
    ]) {
      expect(listed, entry).toContain(entry);
    }
    // The PATCH body is the route's own schema: the fields and the limits it enforces.
    const patch = doc.paths["/api/checklists/{id}/items/{itemId}"].patch;
    const bodyRef = refs(patch.requestBody)[0];
    const body = doc.components?.schemas?.[bodyRef.split("/").at(-1) ?? ""] as {
      properties: Record<string, { maximum?: number; maxLength?: number; minimum?: number }>;
    };
    expect(Object.keys(body.properties).sort()).toEqual(["checked", "note", "quantity"]);
    expect(body.properties.quantity).toMatchObject({ minimum: 1, maximum: 999 });
    // The Library's query parameters come from the Library's own query schema.
    const query = (doc.paths["/api/guides"].get.parameters ?? []).filter((p) => p.in === "query").map((p) => p.name);
    for (const name of [
      "make",
      "model",
      "generation",
      "year",
      "powertrain",
      "drivetrain",
      "category",
      "difficulty",
      "q",
      "page",
    ]) {
      expect(query, name).toContain(name);
    }
  });

  it("has a human page that lists the routes", async () => {
    const response = await app.client().get("/api/docs");
    expect(response.status).toBe(200);
    const text = plainText(await response.text());
    expect(text).toContain("/api/openapi.json");
    expect(text).toContain("PATCH /api/checklists/{id}/items/{itemId}");
    expect(text).toContain("GET /api/guides/{slug}");
  });
});
