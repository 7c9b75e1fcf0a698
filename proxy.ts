import { type NextRequest, NextResponse } from "next/server";
import { sessionCookieFromRequest, unsealSession } from "@/app/_lib/session";

/**
 * Optimistic redirect only, not the auth boundary: a visitor without a
 * readable session cookie is sent to the sign-in page (with the page they
 * asked for), so they never see a half-rendered studio. Every page, route
 * handler and action still verifies the session against the database itself
 * (app/_lib/dal.ts). API routes are left alone: they answer 401 as JSON.
 */
export async function proxy(request: NextRequest) {
  const payload = await unsealSession(sessionCookieFromRequest(request));
  if (payload) return NextResponse.next();
  const signIn = new URL("/sign-in", request.url);
  const asked = `${request.nextUrl.pathname}${request.nextUrl.search}`;
  if (asked !== "/") signIn.searchParams.set("next", asked);
  return NextResponse.redirect(signIn);
}

export const config = {
  // Every page except the public ones: home, sign-in, invitation and password
  // reset links, the API, Next's own assets and files with an extension.
  matcher: [
    "/((?!$|sign-in|join/|reset-password|forgot-password|api/|_next/|.*\\.[a-zA-Z0-9]+$).*)",
  ],
};
