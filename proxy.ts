import { withAuth } from "next-auth/middleware";

// Only redirects signed-out visitors to sign-in. Every page, action and handler still
// checks the caller's permission itself on the server.
export default withAuth({ pages: { signIn: "/sign-in" } });

export const config = {
  matcher: ["/((?!api|_next|sign-in|set-password|unsubscribe|favicon.ico|robots.txt).*)"],
};
