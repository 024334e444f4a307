import type { NextAuthOptions } from "next-auth";
import CredentialsProvider from "next-auth/providers/credentials";
import { attemptSignIn, bumpSessionVersion } from "@/db/access/sign-in";
import type { Role } from "./roles";
import { clientAddress } from "./client-address";

export const SESSION_MAX_AGE_S = 12 * 60 * 60;

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
    async session({ session, token }) {
      return {
        expires: session.expires,
        user: { id: String(token.uid ?? ""), name: String(token.name ?? ""), roles: (token.roles ?? []) as Role[] },
      } as typeof session;
    },
  },
  events: {
    async signOut({ token }) {
      if (token?.uid) await bumpSessionVersion(String(token.uid));
    },
  },
};
