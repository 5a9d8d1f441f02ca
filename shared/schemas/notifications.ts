// The e-mails Legwork sends about the work, and each user's choice of which to receive.
import { z } from 'zod';

export const MAIL_KINDS = [
  'run_awaiting_review',
  'run_held',
  'release_ready',
  'release_withdrawn',
  'problem_reported',
] as const;
export const mailKindSchema = z.enum(MAIL_KINDS);
export type MailKind = z.infer<typeof mailKindSchema>;

/** What each kind is, and who receives it, in the words of the settings page. */
export const MAIL_KIND_LABELS: Record<MailKind, { label: string; who: string }> = {
  run_awaiting_review: { label: 'A run awaits review', who: 'safety reviewers' },
  run_held: { label: 'A run is held', who: 'producers and motion engineers' },
  release_ready: { label: 'A release is ready to download', who: "the venue's operators" },
  release_withdrawn: {
    label: 'A release is withdrawn',
    who: "the venue's operators",
  },
  problem_reported: { label: 'A venue reports a problem', who: 'producers and safety reviewers' },
};

/** GET /api/me/notifications answers this; PUT takes the same shape (every kind, or some of them). */
export const notificationSettingsSchema = z.object({
  kinds: z.array(z.object({ kind: mailKindSchema, enabled: z.boolean() })),
});
export type NotificationSettings = z.infer<typeof notificationSettingsSchema>;
export const notificationSettingsBody = notificationSettingsSchema;
