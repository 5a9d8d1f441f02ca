import { z } from 'zod';

/** The roles a member can hold in a studio. One member may hold several. */
export const ROLES = [
  'producer',
  'motion_engineer',
  'safety_reviewer',
  'venue_operator',
  'studio_admin',
] as const;
export const roleSchema = z.enum(ROLES);
export type Role = z.infer<typeof roleSchema>;

/** Each role by name, for code that picks roles (who receives a mail, say) without spelling them. */
export const ROLE: { readonly [R in Role]: R } = {
  producer: 'producer',
  motion_engineer: 'motion_engineer',
  safety_reviewer: 'safety_reviewer',
  venue_operator: 'venue_operator',
  studio_admin: 'studio_admin',
};

/** Labels shown to people; the API uses the ids above. */
export const ROLE_LABELS: Record<Role, string> = {
  producer: 'Producer',
  motion_engineer: 'Motion engineer',
  safety_reviewer: 'Safety reviewer',
  venue_operator: 'Venue operator',
  studio_admin: 'Studio admin',
};
