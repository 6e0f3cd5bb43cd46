/**
 * Auth.js's endpoints, owned by us (auth-astro's injectEndpoints: false) so that nothing
 * reaches Auth.js unchecked: the sign-in body is capped and read first, failed attempts are
 * limited per account and address before any password is hashed, sign-out ends the session
 * on the server, and actions we do not use answer 404.
 */
import { Auth } from '@auth/core';
import type { APIContext, APIRoute } from 'astro';
import authConfig from '../../../../auth.config';
import { readBody } from '../../../lib/server/body';
import { db } from '../../../lib/server/db';
import { json, jsonError } from '../../../lib/server/http';
import { sessionOf } from '../../../lib/server/session-cache';
import { sessionIdOf, userFromSession } from '../../../lib/server/session';
import { endSession } from '../../../lib/server/sessions';
import {
  MAX_EMAIL_LENGTH,
  MAX_PASSWORD_LENGTH,
  MAX_SIGNIN_BODY_BYTES,
  signinAttempt,
} from '../../../lib/server/signin-attempt';
import { recordSigninFailure, recordSigninSuccess, signinHold } from '../../../lib/server/signin-limits';

export const prerender = false;

const notFound = () => jsonError(404, 'No such page.');

/** Auth.js's answer with headers we may change (its own may be immutable). */
function passOn(res: Response, extra: Record<string, string> = {}): Response {
  const headers = new Headers(res.headers);
  for (const [k, v] of Object.entries(extra)) headers.set(k, v);
  return new Response(res.body, { status: res.status, statusText: res.statusText, headers });
}

/** The e-mail typed, kept briefly for the sign-in form, so a wrong password does not empty it. */
export const TYPED_EMAIL_COOKIE = 'coneline-signin-email';

function rememberEmail(ctx: APIContext, email: string): void {
  if (!email || email.length > MAX_EMAIL_LENGTH) return;
  ctx.cookies.set(TYPED_EMAIL_COOKIE, email, { path: '/signin', httpOnly: true, sameSite: 'strict', maxAge: 600 });
}

function backToSignin(ctx: APIContext, params: Record<string, string>, callbackUrl: string | null): Response {
  const q = new URLSearchParams(params);
  if (callbackUrl && callbackUrl.startsWith('/') && !callbackUrl.startsWith('//')) q.set('callbackUrl', callbackUrl);
  return ctx.redirect(`/signin?${q}`, 303);
}

async function signIn(ctx: APIContext): Promise<Response> {
  const { request } = ctx;
  if (!/^application\/x-www-form-urlencoded\s*(;|$)/i.test(request.headers.get('content-type') ?? '')) {
    return jsonError(415, 'Send the sign-in form as application/x-www-form-urlencoded.');
  }
  const body = await readBody(request, MAX_SIGNIN_BODY_BYTES).catch(() => null);
  if (!body) return jsonError(400, 'The sign-in form could not be read.');
  if (body.tooLarge) return jsonError(413, 'The sign-in form is too large.');
  const form = new URLSearchParams(body.text);
  const email = (form.get('email') ?? '').trim();
  const password = form.get('password') ?? '';
  const callbackUrl = form.get('callbackUrl');
  if (!email || !password) {
    rememberEmail(ctx, email);
    return backToSignin(ctx, { code: 'missing' }, callbackUrl);
  }
  if (email.length > MAX_EMAIL_LENGTH || password.length > MAX_PASSWORD_LENGTH) {
    return backToSignin(ctx, { code: 'too-long' }, callbackUrl);
  }

  const k = await db();
  const address = ctx.clientAddress;
  const wait = await signinHold(k, email, address);
  if (wait > 0) {
    rememberEmail(ctx, email);
    return backToSignin(ctx, { code: 'throttled', wait: String(wait) }, callbackUrl);
  }

  const attempt = {} as { outcome?: 'signed-in' | 'wrong' };
  const forwarded = new Request(request.url, { method: 'POST', headers: request.headers, body: body.text });
  const res = await signinAttempt.run(attempt, () => Auth(forwarded, authConfig));
  if (attempt.outcome === 'wrong') {
    await recordSigninFailure(k, email, address);
    rememberEmail(ctx, email);
  }
  if (attempt.outcome === 'signed-in') {
    await recordSigninSuccess(k, email, address);
    ctx.cookies.delete(TYPED_EMAIL_COOKIE, { path: '/signin' });
  }
  return passOn(res);
}

/** Auth.js's own sign-out: this device's session ends on the server, not only its cookie. */
async function signOut(ctx: APIContext): Promise<Response> {
  const body = await readBody(ctx.request, MAX_SIGNIN_BODY_BYTES).catch(() => null);
  if (!body || body.tooLarge) return jsonError(413, 'The sign-out form is too large.');
  const session = await sessionOf(ctx.request).catch(() => null);
  const sid = sessionIdOf(session);
  const forwarded = new Request(ctx.request.url, { method: 'POST', headers: ctx.request.headers, body: body.text });
  const res = await Auth(forwarded, authConfig);
  // Auth.js clears the cookie only once its CSRF check passed: end the session then too.
  const cleared = res.headers.getSetCookie().some((c) => /session-token=;/.test(c));
  if (sid && cleared) await endSession(await db(), sid, 'sign-out');
  return passOn(res);
}

/** The session as Auth.js's client reads it, but only while our session row lives. */
async function session(ctx: APIContext): Promise<Response> {
  const decoded = await sessionOf(ctx.request).catch(() => null);
  const signedIn = decoded ? await userFromSession(decoded) : null;
  if (!signedIn) return json(null);
  const { user } = signedIn;
  return json({
    user: { id: user.id, name: user.name, email: user.email, role: user.role },
    expires: decoded?.expires,
  });
}

export const GET: APIRoute = async (ctx) => {
  const action = ctx.params.auth ?? '';
  if (action === 'session') return session(ctx);
  if (action === 'csrf' || action === 'providers') {
    return passOn(await Auth(ctx.request, authConfig), { 'Cache-Control': 'no-store' });
  }
  return notFound();
};

export const POST: APIRoute = async (ctx) => {
  const action = ctx.params.auth ?? '';
  if (action === 'callback/credentials') return signIn(ctx);
  if (action === 'signout') return signOut(ctx);
  return notFound();
};
