// Auth.js through auth-astro: e-mail and password, JWT sessions carrying id, role and the
// user's session version (checked on every request by src/middleware.ts).
import Credentials from '@auth/core/providers/credentials';
import { CredentialsSignin } from '@auth/core/errors';
import { defineConfig } from 'auth-astro';
import { config } from './src/lib/server/config';
import { db } from './src/lib/server/db';
import { checkPassword } from './src/lib/server/users';
import { clearFailures, isThrottled, recordFailure } from './src/lib/server/throttle';

class MissingFields extends CredentialsSignin {
  override code = 'missing';
}
class WrongCredentials extends CredentialsSignin {
  override code = 'credentials';
}
class Throttled extends CredentialsSignin {
  override code = 'throttled';
}

export default defineConfig({
  // Read at run time: auth-astro's own import.meta.env.AUTH_SECRET is frozen at build time.
  secret: config().authSecret,
  trustHost: true,
  session: { strategy: 'jwt', maxAge: 12 * 60 * 60 },
  pages: { signIn: '/signin', error: '/signin' },
  providers: [
    Credentials({
      credentials: { email: { label: 'E-mail' }, password: { label: 'Password', type: 'password' } },
      async authorize(credentials) {
        const email = typeof credentials?.email === 'string' ? credentials.email.trim() : '';
        const password = typeof credentials?.password === 'string' ? credentials.password : '';
        if (!email || !password) throw new MissingFields();
        if (isThrottled(email)) throw new Throttled();
        const user = await checkPassword(await db(), email, password);
        if (!user) {
          recordFailure(email);
          throw new WrongCredentials();
        }
        clearFailures(email);
        return { id: String(user.id), email: user.email, name: user.name, role: user.role, sv: user.session_version };
      },
    }),
  ],
  callbacks: {
    jwt({ token, user }) {
      if (user) {
        const u = user as { id?: string; role?: string; sv?: number };
        token.uid = Number(u.id);
        token.role = u.role;
        token.sv = u.sv;
      }
      return token;
    },
    session({ session, token }) {
      const s = session as unknown as { user: Record<string, unknown> };
      s.user = { ...s.user, id: token.uid, role: token.role, sv: token.sv };
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
