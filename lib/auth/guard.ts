import "server-only";
import { cache } from "react";
import { cookies } from "next/headers";
import { redirect } from "next/navigation";
import { NextResponse } from "next/server";
import type { z } from "zod";
import { readSession } from "@/auth.config";
import type { Member } from "@/lib/data/members";
import { memberForSession } from "@/lib/data/sessions";

import { AppError, isAppError } from "@/lib/errors";
import { crossOriginRefusal } from "@/lib/http/origin";
import { can, type Action } from "./permissions";
import { env } from "@/lib/env";

/**
 * The signed-in member as the database has them now (roles are data), or null when the session
 * has ended: signed out, or issued before the member's sessions were all ended (lib/auth/sessions.ts).
 */
export const currentMember = cache(async (): Promise<Member | null> => {
  // cookies(), not the request's Cookie header: after an action signs in again (a new password),
  // the page it renders must see the new session cookie, which only cookies() reflects.
  const session = await readSession((await cookies()).toString());
  return session ? memberForSession(session) : null;
});

/** The one guard: throws unless a signed-in member may do `action`. */
export async function authorize(action: Action): Promise<Member> {
  const member = await currentMember();
  if (!member) throw new AppError("unauthenticated", "Your session has ended. Sign in again.");
  if (!can(member.role, action)) throw new AppError("forbidden", "Your role does not allow this.");
  return member;
}

/** For pages: the same check, turned into a redirect to sign-in or to the forbidden page. */
export async function requirePage(action: Action): Promise<Member> {
  try {
    return await authorize(action);
  } catch (error) {
    if (isAppError(error) && error.code === "unauthenticated") redirect("/sign-in");
    if (isAppError(error) && error.code === "forbidden") redirect("/forbidden");
    throw error;
  }
}

export function errorResponse(error: unknown): NextResponse {
  if (isAppError(error)) {
    return NextResponse.json({ error: error.code, message: error.message, problems: error.fieldProblems }, { status: error.status });
  }
  console.error(error);
  return NextResponse.json(
    { error: "internal", message: "Something went wrong on our side. Try again; if it keeps happening, tell the coordinator." },
    { status: 500 },
  );
}

type RouteHandler<Params> = (request: Request, context: { member: Member; params: Params }) => Promise<Response>;

/**
 * A request that could change something and does not come from the app's own origin (a page on
 * another site posting with the member's cookie): its 403 answer, or null. Route handlers ask it
 * here; pages and server actions in proxy.ts.
 */
export function crossOriginAnswer(request: Request): Response | null {
  const refusal = crossOriginRefusal({
    method: request.method,
    headers: request.headers,
    appUrl: env("APP_URL"),
  });
  return refusal ? NextResponse.json({ error: "forbidden", message: refusal }, { status: 403 }) : null;
}

/** Wraps every route handler: refuses cross-site changes, authorises, runs, and maps errors to JSON with the right status. */
export function guardedRoute<Params = Record<string, string>>(action: Action, handler: RouteHandler<Params>) {
  return async (request: Request, routeContext: { params: Promise<Params> }): Promise<Response> => {
    const crossOrigin = crossOriginAnswer(request);
    if (crossOrigin) return crossOrigin;
    try {
      const member = await authorize(action);
      return await handler(request, { member, params: await routeContext.params });
    } catch (error) {
      return errorResponse(error);
    }
  };
}

export type ActionState = {
  /** "confirm": nothing saved; `warnings` wait for the person to correct or confirm them. */
  status: "idle" | "ok" | "error" | "confirm";
  message?: string;
  fieldErrors?: Record<string, string[]>;
  warnings?: { code: string; field: string; message: string }[];
};

/**
 * Wraps every server action: authorises, validates the form with zod, runs, and returns a
 * state the form can show next to its fields. Never throws to the client.
 */
export function guardedAction<Schema extends z.ZodType>(
  action: Action,
  schema: Schema,
  run: (input: z.infer<Schema>, member: Member) => Promise<ActionState | void>,
) {
  return async (_previous: ActionState, formData: FormData): Promise<ActionState> => {
    let member: Member;
    try {
      member = await authorize(action);
    } catch (error) {
      return { status: "error", message: isAppError(error) ? error.message : "Sign in again." };
    }
    const parsed = schema.safeParse(Object.fromEntries(formData));
    if (!parsed.success) {
      const fieldErrors: Record<string, string[]> = {};
      for (const issue of parsed.error.issues) {
        const field = issue.path.join(".") || "form";
        (fieldErrors[field] ??= []).push(issue.message);
      }
      return { status: "error", message: "Some fields need attention.", fieldErrors };
    }
    try {
      return (await run(parsed.data, member)) ?? { status: "ok" };
    } catch (error) {
      if (isAppError(error)) {
        const fieldErrors: Record<string, string[]> = {};
        for (const problem of error.fieldProblems) (fieldErrors[problem.field] ??= []).push(problem.message);
        return { status: "error", message: error.message, fieldErrors };
      }
      throw error;
    }
  };
}
