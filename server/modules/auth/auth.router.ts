import type { IncomingMessage } from 'node:http';
import { Router, type RequestHandler } from 'express';
import passport from 'passport';
import { Strategy as LocalStrategy } from 'passport-local';
import type { Db } from '../../db/client.js';
import { SignInBody, type SessionUser } from '../../../shared/schemas/auth.js';
import { AppError } from '../../lib/errors.js';
import { validate } from '../../middleware/validate.js';
import { authenticate, loadSessionUser } from './auth.service.js';
import { userReadWithSession } from '../../lib/session-store.js';

export function configurePassport(db: Db) {
  passport.use(
    new LocalStrategy({ usernameField: 'email', passwordField: 'password' }, (email, password, done) => {
      authenticate(db, email, password).then((user) => done(null, user ?? false), done);
    }),
  );
  passport.serializeUser((user, done) => done(null, (user as SessionUser).id));
  // Reloaded on every request so a changed role or a deactivated account takes effect at once.
  passport.deserializeUser((req: IncomingMessage, id: string, done: (err: unknown, user?: SessionUser | false) => void) => {
    // Usually read in the same statement as the session (readUserWithSession in app.ts).
    const read = userReadWithSession<SessionUser>(req, id);
    if (read !== undefined) return done(null, read ?? false);
    loadSessionUser(db, id).then((user) => done(null, user ?? false), done);
  });
}

export function authRouter(generateCsrfToken: (req: Parameters<RequestHandler>[0], overwrite?: boolean) => string): Router {
  const router = Router();

  router.get('/session', (req, res) => {
    const user = (req.user as SessionUser | undefined) ?? null;
    res.json({ user, csrfToken: user ? generateCsrfToken(req) : null });
  });

  router.post('/sign-in', validate({ body: SignInBody }), (req, res, next) => {
    passport.authenticate('local', (err: unknown, user: SessionUser | false) => {
      if (err) return next(err);
      if (!user) return next(new AppError('UNAUTHENTICATED', 401, 'E-mail or password is not right'));
      // passport 0.7 regenerates the session id here (session fixation defence).
      req.login(user, (loginErr) => {
        if (loginErr) return next(loginErr);
        res.json({ user, csrfToken: generateCsrfToken(req, true) });
      });
    })(req, res, next);
  });

  router.post('/sign-out', (req, res, next) => {
    req.logout((err) => {
      if (err) return next(err);
      req.session.destroy(() => {
        res.clearCookie('tw.sid');
        res.status(204).end();
      });
    });
  });

  return router;
}
