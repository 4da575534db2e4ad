import type { NextRequest } from "next/server";
import { handlers } from "@/auth";
import { crossOriginAnswer } from "@/lib/auth/guard";

export const { GET } = handlers;

/** Sign-in and sign-out posts from another site are refused, as every other route's are (Auth.js's own CSRF token aside). */
export async function POST(request: NextRequest): Promise<Response> {
  return crossOriginAnswer(request) ?? handlers.POST(request);
}
