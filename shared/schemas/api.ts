// Request and response shapes of the JSON API under /api, written once and used by the server
// (validation), the browser (typed fetches) and the tests.
import { z } from 'zod';
import { text } from './text';
import { roleSchema } from './roles';

export const emailSchema = text().trim().toLowerCase().email('must be an e-mail address').max(254);
export const passwordSchema = text().min(10, 'must be at least 10 characters').max(200);

export const loginBody = z.object({ email: emailSchema, password: text().min(1).max(200) });
export const resetRequestBody = z.object({ email: emailSchema });
export const resetConfirmBody = z.object({ token: text().min(10).max(200), password: passwordSchema });
export const acceptInvitationBody = z.object({
  name: text().trim().min(1).max(120).optional(),
  password: passwordSchema.optional(),
});

export const inviteBody = z.object({
  email: emailSchema,
  roles: z.array(roleSchema).min(1, 'choose at least one role'),
  venueIds: z.array(z.string().uuid()).default([]),
});
export const memberUpdateBody = z.object({
  roles: z.array(roleSchema).min(1, 'choose at least one role'),
  venueIds: z.array(z.string().uuid()).default([]),
});

export const userSchema = z.object({ id: z.string().uuid(), email: z.string(), name: z.string() });
export const membershipSchema = z.object({
  studioId: z.string().uuid(),
  studioName: z.string(),
  studioSlug: z.string(),
  roles: z.array(roleSchema),
  venueIds: z.array(z.string().uuid()),
});
export const meResponse = z.object({ user: userSchema, memberships: z.array(membershipSchema) });
export type Me = z.infer<typeof meResponse>;
export type Membership = z.infer<typeof membershipSchema>;

export const memberSchema = z.object({
  userId: z.string().uuid(),
  email: z.string(),
  name: z.string(),
  roles: z.array(roleSchema),
  venueIds: z.array(z.string().uuid()),
  joinedAt: z.string(),
});
export type Member = z.infer<typeof memberSchema>;

export const invitationSchema = z.object({
  id: z.string().uuid(),
  email: z.string(),
  roles: z.array(roleSchema),
  venueIds: z.array(z.string().uuid()),
  expiresAt: z.string(),
  acceptedAt: z.string().nullable(),
  /** Only in the answer to sending one: false when the mail server could not take the invitation mail. */
  mailSent: z.boolean().optional(),
});
export type Invitation = z.infer<typeof invitationSchema>;

export const venueSchema = z.object({
  id: z.string().uuid(),
  name: z.string(),
  site: z.string(),
  timeZone: z.string(),
  baseKind: z.enum(['hexapod', 'planar3']),
  controllerRate_hz: z.number(),
  seatCount: z.number().int(),
});
export type Venue = z.infer<typeof venueSchema>;

// The audit event's shape lives with the audit log's other shapes.
export { auditEventSchema } from './audit';
export type { AuditEvent } from './audit';

export const mailMessageSchema = z.object({
  id: z.string(),
  at: z.string(),
  from: z.string(),
  to: z.array(z.string()),
  subject: z.string(),
  text: z.string(),
});
export type MailMessage = z.infer<typeof mailMessageSchema>;

/** Every error answer of the API has this shape; `issues` lists field problems for forms. */
export const apiErrorSchema = z.object({
  error: z.string(),
  issues: z.array(z.object({ path: z.string(), message: z.string() })).optional(),
});
export type ApiError = z.infer<typeof apiErrorSchema>;
