import { apiMemberMiddleware } from "~/.server/guard";
import type { Route } from "./+types/api-layout";

/**
 * The JSON routes of signed-in members: the scope is resolved once, here, and
 * refusals answer in the API's error shape. Sign-in's own routes stay outside.
 */
export const middleware: Route.MiddlewareFunction[] = [apiMemberMiddleware];
