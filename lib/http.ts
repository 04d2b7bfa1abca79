import { NextResponse } from "next/server";
import type { z } from "zod";

/** Error codes of the JSON error shape `{ error: { code, message, issues? } }`, used by every route. */
export type ErrorCode =
  | "bad_request"
  | "unauthenticated"
  | "forbidden"
  | "not_found"
  | "conflict"
  | "validation_failed"
  | "rate_limited"
  | "payload_too_large"
  | "unavailable"
  | "gone"
  | "internal";

export interface ErrorIssue {
  path: string;
  message: string;
}

/** An error meant for the client: its status, code and message are sent as they are. */
export class HttpError extends Error {
  constructor(
    readonly status: number,
    readonly code: ErrorCode,
    message: string,
    readonly issues?: ErrorIssue[],
  ) {
    super(message);
    this.name = "HttpError";
  }
}

export const unauthenticated = () => new HttpError(401, "unauthenticated", "Sign in to use this resource.");
export const forbidden = (what = "this resource") => new HttpError(403, "forbidden", `Your role does not allow access to ${what}.`);
export const notFound = (what = "resource") => new HttpError(404, "not_found", `No such ${what}.`);

/** Converts zod issues into `{ path, message }` pairs with dotted paths. */
export function zodIssues(error: z.ZodError): ErrorIssue[] {
  return error.issues.map((i) => ({ path: i.path.map(String).join("."), message: i.message }));
}

/** Validates with a zod schema; throws a 422 HttpError listing every issue. */
export function parseOr422<T>(schema: z.ZodType<T>, value: unknown, what = "request"): T {
  const parsed = schema.safeParse(value);
  if (!parsed.success) throw new HttpError(422, "validation_failed", `The ${what} is not valid.`, zodIssues(parsed.error));
  return parsed.data;
}

/** Reads a JSON body; malformed JSON is a 400. */
export async function readJson(request: Request): Promise<unknown> {
  try {
    return await request.json();
  } catch {
    throw new HttpError(400, "bad_request", "The request body is not valid JSON.");
  }
}

export function errorResponse(error: unknown): NextResponse {
  if (error instanceof HttpError) {
    const body = { error: { code: error.code, message: error.message, ...(error.issues ? { issues: error.issues } : {}) } };
    return NextResponse.json(body, { status: error.status });
  }
  // Internals go to the server log only, never to the client.
  console.error("unhandled error in route handler", error);
  return NextResponse.json(
    { error: { code: "internal", message: "Something went wrong on the server; the error was logged." } },
    { status: 500 },
  );
}

/** Wraps a route handler so that every thrown error becomes the one JSON error shape. */
export function route<A extends unknown[]>(handler: (...args: A) => Promise<Response>) {
  return async (...args: A): Promise<Response> => {
    try {
      return await handler(...args);
    } catch (error) {
      return errorResponse(error);
    }
  };
}
