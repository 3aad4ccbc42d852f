import { openDataJson } from "@/server/open-data/answers";
import { defineRoute } from "@/server/http/define-route";
import { OPENAPI_DOCUMENT } from "@/lib/domain/publish/openapi";

/** The OpenAPI 3.1 description of the open data API. */
export const GET = defineRoute({ roles: "public" }, async () => openDataJson(OPENAPI_DOCUMENT, { "Cache-Control": "public, max-age=3600" }));
