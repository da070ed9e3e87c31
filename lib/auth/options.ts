import "server-only";
// next-auth configuration: e-mail and password against the users table, a signed JWT in
// an HTTP-only cookie. The role in the token is only a hint for the layout; every route
// re-reads the user (lib/auth/session.ts), so a role change or deactivation applies at once.
import type { NextAuthOptions } from "next-auth";
import Credentials from "next-auth/providers/credentials";
import { getPrisma } from "../db/client";
import { findUserForSignIn } from "../db/users";
import { verifyPassword } from "./password";
import { serverEnv } from "../env";

export const authOptions: NextAuthOptions = {
  // Read at request time, so a build needs no secret.
  get secret() {
    return serverEnv().NEXTAUTH_SECRET;
  },
  session: { strategy: "jwt", maxAge: 12 * 60 * 60 },
  pages: { signIn: "/signin" },
  providers: [
    Credentials({
      name: "E-mail and password",
      credentials: { email: { label: "E-mail", type: "email" }, password: { label: "Password", type: "password" } },
      async authorize(credentials) {
        const email = credentials?.email ?? "";
        const password = credentials?.password ?? "";
        if (!email || !password) return null;
        const user = await findUserForSignIn(await getPrisma(), email);
        if (!user || !user.active) return null;
        if (!(await verifyPassword(password, user.passwordHash))) return null;
        return { id: user.id, email: user.email, name: user.name, role: user.role };
      },
    }),
  ],
  callbacks: {
    async jwt({ token, user }) {
      if (user) {
        token.sub = user.id;
        token.role = (user as { role?: string }).role;
      }
      return token;
    },
    async session({ session, token }) {
      if (session.user) {
        (session.user as { id?: string }).id = token.sub;
        (session.user as { role?: unknown }).role = token.role;
      }
      return session;
    },
  },
};
