import type { RequestHandler } from 'express';
import { HttpError, forbidden } from '../lib/http-error';
import type { Permission } from './permissions';
import { allows } from './permissions';

/** 403 unless the member's roles in this studio grant `permission`. */
export const requirePermission =
  (permission: Permission): RequestHandler =>
  (req, _res, next) => {
    if (!req.member) return next(new HttpError(500, 'membership not loaded'));
    if (!allows(req.member.roles, permission)) return next(forbidden());
    next();
  };
