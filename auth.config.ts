// Auth.js through auth-astro: e-mail and password. The JWT carries the user's id, role and a
// server-side session id; src/middleware.ts looks the session up on every request, so
// sessions can be ended (src/lib/server/sessions.ts). Our own route (src/pages/api/auth)
// limits the body and failed attempts before Auth.js runs.
import Credentials from '@auth/core/providers/credentials';
import { CredentialsSignin } from '@auth/core/errors';
import { defineConfig } from 'auth-astro';
import { config } from './src/lib/server/config';
import { db } from './src/lib/server/db';
import { createSession, SESSION_MAX_AGE_S } from './src/lib/server/sessions';
import { MAX_EMAIL_LENGTH, MAX_PASSWORD_LENGTH, signinAttempt } from './src/lib/server/signin-attempt';
import { checkPassword } from './src/lib/server/users';

class MissingFields extends CredentialsSignin {
  override code = 'missing';
}
class WrongCredentials extends CredentialsSignin {
  override code = 'credentials';
}

export default defineConfig({
  // Read at run time: auth-astro's own import.meta.env.AUTH_SECRET is frozen at build time.
  secret: config().authSecret,
  trustHost: true,
  session: { strategy: 'jwt', maxAge: SESSION_MAX_AGE_S },
  pages: { signIn: '/signin', error: '/signin' },
  providers: [
    Credentials({
      credentials: { email: { label: 'E-mail' }, password: { label: 'Password', type: 'password' } },
      async authorize(credentials) {
        const attempt = signinAttempt.getStore();
        // Only the sign-in route, which has checked the limits, may have a password checked.
        if (!attempt) throw new WrongCredentials();
        const email = typeof credentials?.email === 'string' ? credentials.email.trim() : '';
        const password = typeof credentials?.password === 'string' ? credentials.password : '';
        if (!email || !password || email.length > MAX_EMAIL_LENGTH || password.length > MAX_PASSWORD_LENGTH) {
          throw new MissingFields();
        }
        const k = await db();
        const user = await checkPassword(k, email, password);
        if (!user) {
          attempt.outcome = 'wrong';
          throw new WrongCredentials();
        }
        attempt.outcome = 'signed-in';
        const sid = await createSession(k, user.id);
        return { id: String(user.id), email: user.email, name: user.name, role: user.role, sid };
      },
    }),
  ],
  callbacks: {
    jwt({ token, user }) {
      if (user) {
        const u = user as { id?: string; role?: string; sid?: string };
        token.uid = Number(u.id);
        token.role = u.role;
        token.sid = u.sid;
      }
      return token;
    },
    session({ session, token }) {
      const s = session as unknown as { user: Record<string, unknown> };
      s.user = { ...s.user, id: token.uid, role: token.role, sid: token.sid };
      return session;
    },
  },
  logger: {
    // A failed sign-in is an expected answer, not a server error; log no e-mail addresses.
    error(error) {
      const type = (error as { type?: string }).type;
      if (type === 'CredentialsSignin') return;
      console.error(`[auth] ${type ?? error.name}: ${error.message}`);
    },
    warn() {},
  },
});
