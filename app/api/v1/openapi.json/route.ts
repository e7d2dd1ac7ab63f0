import { json, route } from "@/lib/server/route";
import { openApiDocument } from "@/lib/server/openapi";
import { env } from "@/lib/server/env";

/** GET /api/v1/openapi.json — the OpenAPI 3.1 description of this API (public). */
export const GET = route(async () =>
  json(openApiDocument(env().APP_URL), 200, { "Cache-Control": "public, max-age=300" }),
);
