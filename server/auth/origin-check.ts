import type { RequestHandler } from 'express';
import { AppError } from '../lib/app-error';

const safeMethods = new Set(['GET', 'HEAD', 'OPTIONS']);

/**
 * Refuses a state-changing API request sent from another site's page (a cross-site form post
 * or fetch). Browsers send Origin on every such request; tools that send none are let through,
 * since without a browser there is no ambient cookie to abuse. The sign-in library runs its
 * own, stricter check on /api/auth.
 */
export function sameOriginOnly(trustedOrigins: string[]): RequestHandler {
  const trusted = new Set(trustedOrigins.map((o) => new URL(o).origin));
  return (req, _res, next) => {
    if (safeMethods.has(req.method)) return next();
    const origin = req.get('origin');
    const fetchSite = req.get('sec-fetch-site');
    if (fetchSite === 'cross-site' || (origin !== undefined && !trusted.has(origin))) {
      throw new AppError(
        'forbidden',
        'This request came from another site and was refused. Open Rowtally itself and try again.',
        { reason: 'cross_origin' },
      );
    }
    next();
  };
}
