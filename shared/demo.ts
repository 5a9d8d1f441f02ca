// The demo scenario: a fictional studio, its venues and one member per role. Invented for the demo
// only; nothing here describes a real company, person or ride.
import type { Role } from './schemas/roles';

export const DEMO_PASSWORD = 'legwork-demo';

export const DEMO_STUDIO = { name: 'Lanternfish Studios', slug: 'lanternfish' } as const;
export const DEMO_SECOND_STUDIO = { name: 'Quarry Hill Pictures', slug: 'quarry-hill' } as const;

export const DEMO_VENUES = {
  dome: { name: 'Harbour Lights Dome', site: 'Port Meridian pier', timeZone: 'Europe/Lisbon' },
  arcade: { name: 'Tidewater Arcade', site: 'Saltmarsh boardwalk', timeZone: 'America/Halifax' },
} as const;

export interface DemoUser {
  email: string;
  name: string;
  roles: Role[];
  /** Venue keys of DEMO_VENUES for a venue operator's scope. */
  venues?: (keyof typeof DEMO_VENUES)[];
}

export const DEMO_USERS: DemoUser[] = [
  { email: 'pia.producer@lanternfish.example', name: 'Pia Okafor', roles: ['producer'] },
  { email: 'eli.engineer@lanternfish.example', name: 'Eli Varga', roles: ['motion_engineer'] },
  { email: 'rosa.reviewer@lanternfish.example', name: 'Rosa Lindqvist', roles: ['safety_reviewer'] },
  { email: 'otto.operator@lanternfish.example', name: 'Otto Brenner', roles: ['venue_operator'], venues: ['dome'] },
  { email: 'ada.admin@lanternfish.example', name: 'Ada Moreau', roles: ['studio_admin'] },
];
