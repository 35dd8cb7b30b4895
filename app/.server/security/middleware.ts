import type { MiddlewareFunction } from "react-router";
import { bodyCheck } from "./body-check";
import { securityHeadersMiddleware } from "./headers";
import { originCheck } from "./origin-check";

/** Outermost first: headers go on every answer, refusals included. */
export const rootMiddleware: MiddlewareFunction<Response>[] = [
  securityHeadersMiddleware,
  originCheck,
  bodyCheck,
];
