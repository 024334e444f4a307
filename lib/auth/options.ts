import type { NextAuthOptions } from "next-auth";
import CredentialsProvider from "next-auth/providers/credentials";
import { attemptSignIn } from "@/db/access/people/sign-in";
import { bumpSessionVersion, currentSessionVersion } from "@/db/access/people/session-version";
import type { Role } from "./roles";
import { clientAddress } from "./client-address";

export const SESSION_MAX_AGE_S = 12 * 60 * 60;

class EndedSessionError extends Error {
  constructor() {
    super("session ended");
    this.name = "EndedSessionError";
  }
}

export const authOptions: NextAuthOptions = {
  session: { strategy: "jwt", maxAge: SESSION_MAX_AGE_S },
  pages: { signIn: "/sign-in", error: "/sign-in" },
  providers: [
    CredentialsProvider({
      name: "E-mail and password",
      credentials: { email: { label: "E-mail", type: "email" }, password: { label: "Password", type: "password" } },
      async authorize(credentials, req) {
        const email = typeof credentials?.email === "string" ? credentials.email : "";
        const password = typeof credentials?.password === "string" ? credentials.password : "";
        if (!email || !password || email.length > 320) return null;
        const person = await attemptSignIn(email, password, clientAddress(req?.headers));
        if (!person) return null;
        return { id: person.id, name: person.name, roles: person.roles, sv: person.sessionVersion };
      },
    }),
  ],
  callbacks: {
    async jwt({ token, user }) {
      if (user) {
        const u = user as unknown as { id: string; name: string; roles: Role[]; sv: number };
        token.uid = u.id;
        token.name = u.name;
        token.roles = u.roles;
        token.sv = u.sv;
        delete token.email;
        delete token.picture;
      }
      return token;
    },
    // What the browser can read: id, name, roles and expiry. Nothing else.
    // A token whose person is gone, inactive, or whose session version moved on (sign-out,
    // password or role change) gives no session: throwing makes next-auth answer `{}` and clear
    // the cookie, as it does for a token it cannot read. The same check as getCurrentUser().
    async session({ session, token }) {
      const uid = typeof token.uid === "string" && /^[0-9a-f-]{36}$/i.test(token.uid) ? token.uid : null;
      const stored = uid ? await currentSessionVersion(uid) : null;
      if (!stored || !stored.active || stored.sessionVersion !== token.sv) throw new EndedSessionError();
      return {
        expires: session.expires,
        user: { id: uid, name: stored.name, roles: stored.roles },
      } as typeof session;
    },
  },
  logger: {
    // an ended session is expected (sign-out elsewhere), not an error worth a stack trace
    error(code, metadata) {
      const err = (metadata as { error?: unknown } | undefined)?.error ?? metadata;
      if (code === "JWT_SESSION_ERROR" && err instanceof EndedSessionError) return;
      console.error(`[next-auth][error][${code}]`, metadata);
    },
  },
  events: {
    async signOut({ token }) {
      if (token?.uid) await bumpSessionVersion(String(token.uid));
    },
  },
};
